import { Migration } from '@mikro-orm/migrations';

export class Migration20261205152001 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table "safety_outside_party" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "session_id" uuid not null, "company" varchar(120) not null, "lead_name" varchar(120) not null, "lead_contact" varchar(120) not null, "procedure_title" varchar(160) not null, "procedure_version" varchar(30) not null, "lock_numbers" jsonb not null, "registered_by_id" uuid not null, "acknowledgement" varchar(500) null, "restrictions" text null, "informed_who" varchar(500) null, "locks_applied_at" timestamptz null, "locks_removed_at" timestamptz null, "steps" jsonb not null, constraint "safety_outside_party_pkey" primary key ("id"));`);

    this.addSql(`alter table "safety_outside_party" add constraint "safety_outside_party_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "safety_outside_party" add constraint "safety_outside_party_session_id_foreign" foreign key ("session_id") references "safety_lockout" ("id") on update cascade;`);
    this.addSql(`alter table "safety_outside_party" add constraint "safety_outside_party_registered_by_id_foreign" foreign key ("registered_by_id") references "app_user" ("id") on update cascade;`);

    this.addSql(`alter table "safety_sign_off" drop constraint if exists "safety_sign_off_meaning_check";`);

    this.addSql(`alter table "safety_sign_off" add constraint "safety_sign_off_meaning_check" check("meaning" in ('procedure-approved', 'lockout-applied', 'isolation-verified', 'member-joined', 'member-left', 'handover-offered', 'handover-accepted', 'lockout-released', 'ppe-check-done', 'inspection-performed', 'inspection-certified', 'training-recorded', 'fire-watch-started', 'fire-watch-ended', 'correction', 'safety-work-signed-off', 'deviation-accepted', 'absence-verified', 'contact-attempted', 'removal-authorized', 'absent-locks-removed', 'employee-informed', 'pre-use-check-done', 'testing-window-opened', 'energy-control-reapplied', 'isolation-reverified', 'outside-procedures-exchanged', 'outside-procedure-acknowledged', 'outside-restrictions-informed', 'outside-locks-applied', 'outside-locks-removed'));`);

    this.addSql(`alter table "safety_lockout_point" add column "tag_justification" text check ("tag_justification" in ('cannot-take-lock', 'full-protection')) null, add column "tag_measure" varchar(300) null;`);
  }

  override async down(): Promise<void> {
    this.addSql(`drop table if exists "safety_outside_party" cascade;`);

    this.addSql(`alter table "safety_sign_off" drop constraint if exists "safety_sign_off_meaning_check";`);

    this.addSql(`alter table "safety_lockout_point" drop column "tag_justification", drop column "tag_measure";`);

    this.addSql(`alter table "safety_sign_off" add constraint "safety_sign_off_meaning_check" check("meaning" in ('procedure-approved', 'lockout-applied', 'isolation-verified', 'member-joined', 'member-left', 'handover-offered', 'handover-accepted', 'lockout-released', 'ppe-check-done', 'inspection-performed', 'inspection-certified', 'training-recorded', 'fire-watch-started', 'fire-watch-ended', 'correction', 'safety-work-signed-off', 'deviation-accepted', 'absence-verified', 'contact-attempted', 'removal-authorized', 'absent-locks-removed', 'employee-informed', 'pre-use-check-done', 'testing-window-opened', 'energy-control-reapplied', 'isolation-reverified'));`);
  }

}
