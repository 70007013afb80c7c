import { Migration } from '@mikro-orm/migrations';

export class Migration20261205151001 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table "safety_lockout_test_window" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "session_id" uuid not null, "purpose" text check ("purpose" in ('testing', 'positioning')) not null, "reason" varchar(300) not null, "members_clear" boolean not null default false, "removed" jsonb not null, "opened_at" timestamptz not null, "opened_by_id" uuid not null, "open_sign_off_id" uuid not null, "reapplied_at" timestamptz null, "reapply_sign_off_id" uuid null, "reverified_at" timestamptz null, "reverify_sign_off_id" uuid null, constraint "safety_lockout_test_window_pkey" primary key ("id"));`);
    this.addSql(`create index "safety_lockout_test_window_session_id_opened_at_index" on "safety_lockout_test_window" ("session_id", "opened_at");`);

    this.addSql(`alter table "safety_lockout_test_window" add constraint "safety_lockout_test_window_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "safety_lockout_test_window" add constraint "safety_lockout_test_window_session_id_foreign" foreign key ("session_id") references "safety_lockout" ("id") on update cascade;`);
    this.addSql(`alter table "safety_lockout_test_window" add constraint "safety_lockout_test_window_opened_by_id_foreign" foreign key ("opened_by_id") references "app_user" ("id") on update cascade;`);

    this.addSql(`alter table "safety_sign_off" drop constraint if exists "safety_sign_off_meaning_check";`);

    this.addSql(`alter table "safety_lockout" drop constraint if exists "safety_lockout_state_check";`);

    this.addSql(`alter table "safety_sign_off" add constraint "safety_sign_off_meaning_check" check("meaning" in ('procedure-approved', 'lockout-applied', 'isolation-verified', 'member-joined', 'member-left', 'handover-offered', 'handover-accepted', 'lockout-released', 'ppe-check-done', 'inspection-performed', 'inspection-certified', 'training-recorded', 'fire-watch-started', 'fire-watch-ended', 'correction', 'safety-work-signed-off', 'deviation-accepted', 'absence-verified', 'contact-attempted', 'removal-authorized', 'absent-locks-removed', 'employee-informed', 'pre-use-check-done', 'testing-window-opened', 'energy-control-reapplied', 'isolation-reverified'));`);

    this.addSql(`alter table "safety_lockout" add constraint "safety_lockout_state_check" check("state" in ('locked', 'verified', 'released', 'testing', 'reapplied'));`);
  }

  override async down(): Promise<void> {
    this.addSql(`drop table if exists "safety_lockout_test_window" cascade;`);

    this.addSql(`alter table "safety_lockout" drop constraint if exists "safety_lockout_state_check";`);

    this.addSql(`alter table "safety_sign_off" drop constraint if exists "safety_sign_off_meaning_check";`);

    this.addSql(`alter table "safety_lockout" add constraint "safety_lockout_state_check" check("state" in ('locked', 'verified', 'released'));`);

    this.addSql(`alter table "safety_sign_off" add constraint "safety_sign_off_meaning_check" check("meaning" in ('procedure-approved', 'lockout-applied', 'isolation-verified', 'member-joined', 'member-left', 'handover-offered', 'handover-accepted', 'lockout-released', 'ppe-check-done', 'inspection-performed', 'inspection-certified', 'training-recorded', 'fire-watch-started', 'fire-watch-ended', 'correction', 'safety-work-signed-off', 'deviation-accepted', 'absence-verified', 'contact-attempted', 'removal-authorized', 'absent-locks-removed', 'employee-informed', 'pre-use-check-done'));`);
  }

}
