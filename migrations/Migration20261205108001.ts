import { Migration } from '@mikro-orm/migrations';

// Two migrations of the same day each rewrote the sign-off meanings with only their own additions
// (safety work sign-off and deviations; the absent-employee steps). This one allows all of them.
const BASE = `'procedure-approved', 'lockout-applied', 'isolation-verified', 'member-joined', 'member-left', 'handover-offered', 'handover-accepted', 'lockout-released', 'ppe-check-done', 'inspection-performed', 'inspection-certified', 'training-recorded', 'fire-watch-started', 'fire-watch-ended', 'correction'`;
const ABSENT = `'absence-verified', 'contact-attempted', 'removal-authorized', 'absent-locks-removed', 'employee-informed'`;
const SAFETY_WORK = `'safety-work-signed-off', 'deviation-accepted'`;

export class Migration20261205108001 extends Migration {
  override async up(): Promise<void> {
    this.addSql(`alter table "safety_sign_off" drop constraint if exists "safety_sign_off_meaning_check";`);
    this.addSql(`alter table "safety_sign_off" add constraint "safety_sign_off_meaning_check" check("meaning" in (${BASE}, ${SAFETY_WORK}, ${ABSENT}));`);
  }

  override async down(): Promise<void> {
    this.addSql(`alter table "safety_sign_off" drop constraint if exists "safety_sign_off_meaning_check";`);
    this.addSql(`alter table "safety_sign_off" add constraint "safety_sign_off_meaning_check" check("meaning" in (${BASE}, ${ABSENT}));`);
  }
}
