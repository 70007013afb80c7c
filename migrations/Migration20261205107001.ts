import { Migration } from '@mikro-orm/migrations';

export class Migration20261205107001 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table "safety_event" ("id" uuid not null, "organization_id" uuid not null, "at" timestamptz not null, "kind" text check ("kind" in ('refused', 'alarm')) not null, "action" varchar(60) not null, "reason" text not null, "person_id" uuid null, "person_name" varchar(120) null, "machine_id" uuid null, "subject_id" uuid null, "details" jsonb not null, "dedupe_key" varchar(200) null, constraint "safety_event_pkey" primary key ("id"));`);
    this.addSql(`create index "safety_event_organization_id_at_index" on "safety_event" ("organization_id", "at");`);
    this.addSql(`create index "safety_event_machine_id_kind_at_index" on "safety_event" ("machine_id", "kind", "at");`);
    this.addSql(`alter table "safety_event" add constraint "safety_event_organization_id_dedupe_key_unique" unique ("organization_id", "dedupe_key");`);

    this.addSql(`create table "safety_absent_removal" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "session_id" uuid not null, "absent_user_id" uuid not null, "supervisor_id" uuid not null, "step" text check ("step" in ('absence-verified', 'contact-attempted', 'removal-authorized', 'locks-removed', 'employee-informed')) not null, "steps" jsonb not null, "locks" jsonb not null, constraint "safety_absent_removal_pkey" primary key ("id"));`);

    this.addSql(`alter table "safety_event" add constraint "safety_event_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update no action on delete no action;`);
    this.addSql(`alter table "safety_event" add constraint "safety_event_person_id_foreign" foreign key ("person_id") references "app_user" ("id") on update no action on delete no action;`);
    this.addSql(`alter table "safety_event" add constraint "safety_event_machine_id_foreign" foreign key ("machine_id") references "machine" ("id") on update no action on delete no action;`);

    this.addSql(`alter table "safety_absent_removal" add constraint "safety_absent_removal_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "safety_absent_removal" add constraint "safety_absent_removal_session_id_foreign" foreign key ("session_id") references "safety_lockout" ("id") on update cascade;`);
    this.addSql(`alter table "safety_absent_removal" add constraint "safety_absent_removal_absent_user_id_foreign" foreign key ("absent_user_id") references "app_user" ("id") on update cascade;`);
    this.addSql(`alter table "safety_absent_removal" add constraint "safety_absent_removal_supervisor_id_foreign" foreign key ("supervisor_id") references "app_user" ("id") on update cascade;`);

    this.addSql(`alter table "safety_sign_off" drop constraint if exists "safety_sign_off_meaning_check";`);

    this.addSql(`alter table "safety_training" drop constraint if exists "safety_training_kind_check";`);

    this.addSql(`alter table "safety_sign_off" add constraint "safety_sign_off_meaning_check" check("meaning" in ('procedure-approved', 'lockout-applied', 'isolation-verified', 'member-joined', 'member-left', 'handover-offered', 'handover-accepted', 'lockout-released', 'ppe-check-done', 'inspection-performed', 'inspection-certified', 'training-recorded', 'fire-watch-started', 'fire-watch-ended', 'correction', 'absence-verified', 'contact-attempted', 'removal-authorized', 'absent-locks-removed', 'employee-informed'));`);

    this.addSql(`alter table "safety_training" add column "minor_task" varchar(40) null;`);
    this.addSql(`alter table "safety_training" add constraint "safety_training_kind_check" check("kind" in ('authorized', 'affected', 'minor-servicing'));`);

    this.addSql(`alter table "safety_inspection" add column "deviation_employees" jsonb not null default '[]';`);
    // Refusals and alarms are evidence: like the sign-offs, never changed or removed.
    this.addSql(`create or replace function safety_event_append_only() returns trigger language plpgsql as $$
begin
  raise exception 'safety_event is append-only: % is not allowed', tg_op using errcode = 'P0001';
end;
$$;`);
    this.addSql(`create trigger safety_event_no_change before update or delete on "safety_event" for each row execute function safety_event_append_only();`);
    this.addSql(`create trigger safety_event_no_truncate before truncate on "safety_event" for each statement execute function safety_event_append_only();`);
  }

  override async down(): Promise<void> {
    this.addSql(`drop table if exists "safety_event" cascade;`);
    this.addSql(`drop function if exists safety_event_append_only();`);

    this.addSql(`drop table if exists "safety_absent_removal" cascade;`);

    this.addSql(`alter table "safety_sign_off" drop constraint if exists "safety_sign_off_meaning_check";`);

    this.addSql(`alter table "safety_training" drop constraint if exists "safety_training_kind_check";`);

    this.addSql(`alter table "safety_inspection" drop column "deviation_employees";`);

    this.addSql(`alter table "safety_sign_off" add constraint "safety_sign_off_meaning_check" check("meaning" in ('procedure-approved', 'lockout-applied', 'isolation-verified', 'member-joined', 'member-left', 'handover-offered', 'handover-accepted', 'lockout-released', 'ppe-check-done', 'inspection-performed', 'inspection-certified', 'training-recorded', 'fire-watch-started', 'fire-watch-ended', 'correction'));`);

    this.addSql(`alter table "safety_training" drop column "minor_task";`);

    this.addSql(`alter table "safety_training" add constraint "safety_training_kind_check" check("kind" in ('authorized', 'affected'));`);
  }

}
