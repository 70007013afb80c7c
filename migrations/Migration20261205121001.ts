import { Migration } from '@mikro-orm/migrations';

export class Migration20261205121001 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table "machine_pre_use_check" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "machine_id" uuid not null, "person_id" uuid not null, "checked_at" timestamptz not null, "lines" jsonb not null, "pass" boolean not null, "safety_critical_failed" boolean not null, "sign_off_id" uuid not null, "work_order_id" uuid null, "work_order_number" int null, constraint "machine_pre_use_check_pkey" primary key ("id"));`);
    this.addSql(`create index "machine_pre_use_check_machine_id_checked_at_index" on "machine_pre_use_check" ("machine_id", "checked_at");`);

    this.addSql(`alter table "machine_pre_use_check" add constraint "machine_pre_use_check_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "machine_pre_use_check" add constraint "machine_pre_use_check_machine_id_foreign" foreign key ("machine_id") references "machine" ("id") on update cascade on delete no action;`);
    this.addSql(`alter table "machine_pre_use_check" add constraint "machine_pre_use_check_person_id_foreign" foreign key ("person_id") references "app_user" ("id") on update cascade;`);
    this.addSql(`alter table "machine_pre_use_check" add constraint "machine_pre_use_check_sign_off_id_foreign" foreign key ("sign_off_id") references "safety_sign_off" ("id") on update cascade on delete no action;`);

    this.addSql(`alter table "safety_sign_off" drop constraint if exists "safety_sign_off_meaning_check";`);

    this.addSql(`alter table "safety_sign_off" add constraint "safety_sign_off_meaning_check" check("meaning" in ('procedure-approved', 'lockout-applied', 'isolation-verified', 'member-joined', 'member-left', 'handover-offered', 'handover-accepted', 'lockout-released', 'ppe-check-done', 'inspection-performed', 'inspection-certified', 'training-recorded', 'fire-watch-started', 'fire-watch-ended', 'correction', 'safety-work-signed-off', 'deviation-accepted', 'absence-verified', 'contact-attempted', 'removal-authorized', 'absent-locks-removed', 'employee-informed', 'pre-use-check-done'));`);
  }

  override async down(): Promise<void> {
    this.addSql(`drop table if exists "machine_pre_use_check" cascade;`);

    this.addSql(`alter table "safety_sign_off" drop constraint if exists "safety_sign_off_meaning_check";`);

    this.addSql(`alter table "safety_sign_off" add constraint "safety_sign_off_meaning_check" check("meaning" in ('procedure-approved', 'lockout-applied', 'isolation-verified', 'member-joined', 'member-left', 'handover-offered', 'handover-accepted', 'lockout-released', 'ppe-check-done', 'inspection-performed', 'inspection-certified', 'training-recorded', 'fire-watch-started', 'fire-watch-ended', 'correction', 'safety-work-signed-off', 'deviation-accepted', 'absence-verified', 'contact-attempted', 'removal-authorized', 'absent-locks-removed', 'employee-informed'));`);
  }

}
