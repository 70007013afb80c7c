import { Migration } from '@mikro-orm/migrations';

export class Migration20261201211335 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table "safety_procedure" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "machine_id" uuid not null, "title" varchar(160) not null, constraint "safety_procedure_pkey" primary key ("id"));`);

    this.addSql(`create table "safety_ppe_requirement" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "machine_id" uuid not null, "task" varchar(120) not null, "items" jsonb not null, "other_items" jsonb not null, "arc_current_a" double precision null, "noise" jsonb not null, "cadence" text check ("cadence" in ('shift', 'week', 'none')) not null default 'shift', "active" boolean not null default true, constraint "safety_ppe_requirement_pkey" primary key ("id"));`);

    this.addSql(`create table "safety_chain_head" ("id" uuid not null, "organization_id" uuid not null, "last_seq" int not null default 0, "last_hash" varchar(64) not null, "updated_at" timestamptz not null, constraint "safety_chain_head_pkey" primary key ("id"));`);
    this.addSql(`alter table "safety_chain_head" add constraint "safety_chain_head_organization_id_unique" unique ("organization_id");`);

    this.addSql(`create table "safety_task" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "kind" text check ("kind" in ('ppe-check', 'periodic-inspection', 'retraining')) not null, "occurrence_key" varchar(200) not null, "title" varchar(300) not null, "machine_id" uuid null, "due_at" timestamptz null, "status" text check ("status" in ('due', 'overdue', 'done')) not null default 'due', "raised_at" timestamptz not null, "overdue_mailed_at" timestamptz null, "closed_at" timestamptz null, constraint "safety_task_pkey" primary key ("id"));`);
    this.addSql(`alter table "safety_task" add constraint "safety_task_organization_id_kind_occurrence_key_unique" unique ("organization_id", "kind", "occurrence_key");`);

    this.addSql(`create table "safety_sign_off" ("id" uuid not null, "organization_id" uuid not null, "seq" int not null, "signed_at" timestamptz not null, "signer_id" uuid not null, "signer_name" varchar(120) not null, "signer_role" varchar(20) not null, "meaning" text check ("meaning" in ('procedure-approved', 'lockout-applied', 'isolation-verified', 'member-joined', 'member-left', 'handover-offered', 'handover-accepted', 'lockout-released', 'ppe-check-done', 'inspection-performed', 'inspection-certified', 'training-recorded', 'fire-watch-started', 'fire-watch-ended', 'correction')) not null, "statement" text not null, "subject_type" varchar(40) not null, "subject_id" uuid not null, "machine_id" uuid null, "details" jsonb not null, "corrects_id" uuid null, "note" varchar(1000) null, "prev_hash" varchar(64) not null, "hash" varchar(64) not null, constraint "safety_sign_off_pkey" primary key ("id"));`);
    this.addSql(`alter table "safety_sign_off" add constraint "safety_sign_off_hash_unique" unique ("hash");`);
    this.addSql(`create index "safety_sign_off_organization_id_signed_at_index" on "safety_sign_off" ("organization_id", "signed_at");`);
    this.addSql(`create index "safety_sign_off_subject_id_index" on "safety_sign_off" ("subject_id");`);
    this.addSql(`alter table "safety_sign_off" add constraint "safety_sign_off_organization_id_seq_unique" unique ("organization_id", "seq");`);
    this.addSql(`alter table "safety_sign_off" add constraint "safety_sign_off_organization_id_prev_hash_unique" unique ("organization_id", "prev_hash");`);

    this.addSql(`create table "safety_training" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "person_id" uuid not null, "procedure_id" uuid not null, "procedure_version" int not null, "kind" text check ("kind" in ('authorized', 'affected')) not null, "trained_on" date not null, "trainer_id" uuid not null, "note" varchar(500) null, "sign_off_id" uuid not null, constraint "safety_training_pkey" primary key ("id"));`);

    this.addSql(`create table "safety_procedure_version" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "procedure_id" uuid not null, "version" int not null, "status" text check ("status" in ('draft', 'approved', 'superseded')) not null default 'draft', "content" jsonb not null, "author_id" uuid not null, "approved_at" timestamptz null, "approved_by_id" uuid null, "approval_sign_off_id" uuid null, "retraining_required" boolean not null default true, constraint "safety_procedure_version_pkey" primary key ("id"));`);
    this.addSql(`alter table "safety_procedure_version" add constraint "safety_procedure_version_procedure_id_version_unique" unique ("procedure_id", "version");`);

    this.addSql(`create table "safety_procedure_photo" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "version_id" uuid not null, "source_key" varchar(8) not null, "caption" varchar(200) null, "mime" varchar(40) not null, "size" int not null, "data" bytea not null, constraint "safety_procedure_photo_pkey" primary key ("id"));`);

    this.addSql(`create table "safety_ppe_check" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "machine_id" uuid not null, "requirement_id" uuid not null, "person_id" uuid not null, "checked_at" timestamptz not null, "items" jsonb not null, "sign_off_id" uuid not null, constraint "safety_ppe_check_pkey" primary key ("id"));`);
    this.addSql(`create index "safety_ppe_check_machine_id_checked_at_index" on "safety_ppe_check" ("machine_id", "checked_at");`);

    this.addSql(`create table "safety_inspection" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "procedure_id" uuid not null, "procedure_version" int not null, "inspected_on" date not null, "inspector_id" uuid not null, "employees" jsonb not null, "findings" text not null, "deviations" text null, "performed_sign_off_id" uuid not null, "certified_at" timestamptz null, "certified_by_id" uuid null, "certify_sign_off_id" uuid null, constraint "safety_inspection_pkey" primary key ("id"));`);

    this.addSql(`create table "safety_lockout" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "machine_id" uuid not null, "procedure_id" uuid not null, "procedure_version_id" uuid not null, "work_order_id" uuid null, "reason" varchar(300) not null, "group" boolean not null default false, "state" text check ("state" in ('locked', 'verified', 'released')) not null default 'locked', "primary_id" uuid not null, "pending_handover_to_id" uuid null, "applied_at" timestamptz not null, "verified_at" timestamptz null, "released_at" timestamptz null, constraint "safety_lockout_pkey" primary key ("id"));`);
    this.addSql(`create index "safety_lockout_organization_id_state_index" on "safety_lockout" ("organization_id", "state");`);

    this.addSql(`create table "safety_lockout_point" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "session_id" uuid not null, "source_key" varchar(8) not null, "device" text check ("device" in ('lock-and-tag', 'lock', 'tag-only', 'valve-cover', 'plug-cover', 'blocking')) not null, "lock_number" varchar(30) not null, "tag_number" varchar(30) null, "applied_by_id" uuid not null, "holder_id" uuid not null, "applied_at" timestamptz not null, "removed_at" timestamptz null, "removed_by_id" uuid null, constraint "safety_lockout_point_pkey" primary key ("id"));`);

    this.addSql(`create table "safety_lockout_member" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "session_id" uuid not null, "user_id" uuid not null, "lock_number" varchar(30) not null, "joined_at" timestamptz not null, "left_at" timestamptz null, constraint "safety_lockout_member_pkey" primary key ("id"));`);

    this.addSql(`create table "safety_fire_watch" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "machine_id" uuid not null, "watcher_id" uuid not null, "cutting_ended_at" timestamptz not null, "until" timestamptz not null, "rule" varchar(40) not null, "area" varchar(200) null, "ended_at" timestamptz null, "start_sign_off_id" uuid not null, "end_sign_off_id" uuid null, constraint "safety_fire_watch_pkey" primary key ("id"));`);

    this.addSql(`alter table "safety_procedure" add constraint "safety_procedure_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "safety_procedure" add constraint "safety_procedure_machine_id_foreign" foreign key ("machine_id") references "machine" ("id") on update cascade on delete no action;`);

    this.addSql(`alter table "safety_ppe_requirement" add constraint "safety_ppe_requirement_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "safety_ppe_requirement" add constraint "safety_ppe_requirement_machine_id_foreign" foreign key ("machine_id") references "machine" ("id") on update cascade on delete no action;`);

    this.addSql(`alter table "safety_chain_head" add constraint "safety_chain_head_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);

    this.addSql(`alter table "safety_task" add constraint "safety_task_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "safety_task" add constraint "safety_task_machine_id_foreign" foreign key ("machine_id") references "machine" ("id") on update cascade on delete set null;`);

    this.addSql(`alter table "safety_sign_off" add constraint "safety_sign_off_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update no action on delete no action;`);
    this.addSql(`alter table "safety_sign_off" add constraint "safety_sign_off_signer_id_foreign" foreign key ("signer_id") references "app_user" ("id") on update no action on delete no action;`);
    this.addSql(`alter table "safety_sign_off" add constraint "safety_sign_off_machine_id_foreign" foreign key ("machine_id") references "machine" ("id") on update no action on delete no action;`);
    this.addSql(`alter table "safety_sign_off" add constraint "safety_sign_off_corrects_id_foreign" foreign key ("corrects_id") references "safety_sign_off" ("id") on update no action on delete no action;`);

    this.addSql(`alter table "safety_training" add constraint "safety_training_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "safety_training" add constraint "safety_training_person_id_foreign" foreign key ("person_id") references "app_user" ("id") on update cascade;`);
    this.addSql(`alter table "safety_training" add constraint "safety_training_procedure_id_foreign" foreign key ("procedure_id") references "safety_procedure" ("id") on update cascade;`);
    this.addSql(`alter table "safety_training" add constraint "safety_training_trainer_id_foreign" foreign key ("trainer_id") references "app_user" ("id") on update cascade;`);
    this.addSql(`alter table "safety_training" add constraint "safety_training_sign_off_id_foreign" foreign key ("sign_off_id") references "safety_sign_off" ("id") on update cascade on delete no action;`);

    this.addSql(`alter table "safety_procedure_version" add constraint "safety_procedure_version_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "safety_procedure_version" add constraint "safety_procedure_version_procedure_id_foreign" foreign key ("procedure_id") references "safety_procedure" ("id") on update cascade;`);
    this.addSql(`alter table "safety_procedure_version" add constraint "safety_procedure_version_author_id_foreign" foreign key ("author_id") references "app_user" ("id") on update cascade;`);
    this.addSql(`alter table "safety_procedure_version" add constraint "safety_procedure_version_approved_by_id_foreign" foreign key ("approved_by_id") references "app_user" ("id") on update cascade on delete set null;`);
    this.addSql(`alter table "safety_procedure_version" add constraint "safety_procedure_version_approval_sign_off_id_foreign" foreign key ("approval_sign_off_id") references "safety_sign_off" ("id") on update cascade on delete no action;`);

    this.addSql(`alter table "safety_procedure_photo" add constraint "safety_procedure_photo_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "safety_procedure_photo" add constraint "safety_procedure_photo_version_id_foreign" foreign key ("version_id") references "safety_procedure_version" ("id") on update cascade on delete cascade;`);

    this.addSql(`alter table "safety_ppe_check" add constraint "safety_ppe_check_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "safety_ppe_check" add constraint "safety_ppe_check_machine_id_foreign" foreign key ("machine_id") references "machine" ("id") on update cascade on delete no action;`);
    this.addSql(`alter table "safety_ppe_check" add constraint "safety_ppe_check_requirement_id_foreign" foreign key ("requirement_id") references "safety_ppe_requirement" ("id") on update cascade;`);
    this.addSql(`alter table "safety_ppe_check" add constraint "safety_ppe_check_person_id_foreign" foreign key ("person_id") references "app_user" ("id") on update cascade;`);
    this.addSql(`alter table "safety_ppe_check" add constraint "safety_ppe_check_sign_off_id_foreign" foreign key ("sign_off_id") references "safety_sign_off" ("id") on update cascade on delete no action;`);

    this.addSql(`alter table "safety_inspection" add constraint "safety_inspection_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "safety_inspection" add constraint "safety_inspection_procedure_id_foreign" foreign key ("procedure_id") references "safety_procedure" ("id") on update cascade;`);
    this.addSql(`alter table "safety_inspection" add constraint "safety_inspection_inspector_id_foreign" foreign key ("inspector_id") references "app_user" ("id") on update cascade;`);
    this.addSql(`alter table "safety_inspection" add constraint "safety_inspection_performed_sign_off_id_foreign" foreign key ("performed_sign_off_id") references "safety_sign_off" ("id") on update cascade on delete no action;`);
    this.addSql(`alter table "safety_inspection" add constraint "safety_inspection_certified_by_id_foreign" foreign key ("certified_by_id") references "app_user" ("id") on update cascade on delete set null;`);
    this.addSql(`alter table "safety_inspection" add constraint "safety_inspection_certify_sign_off_id_foreign" foreign key ("certify_sign_off_id") references "safety_sign_off" ("id") on update cascade on delete no action;`);

    this.addSql(`alter table "safety_lockout" add constraint "safety_lockout_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "safety_lockout" add constraint "safety_lockout_machine_id_foreign" foreign key ("machine_id") references "machine" ("id") on update cascade on delete no action;`);
    this.addSql(`alter table "safety_lockout" add constraint "safety_lockout_procedure_id_foreign" foreign key ("procedure_id") references "safety_procedure" ("id") on update cascade;`);
    this.addSql(`alter table "safety_lockout" add constraint "safety_lockout_procedure_version_id_foreign" foreign key ("procedure_version_id") references "safety_procedure_version" ("id") on update cascade;`);
    this.addSql(`alter table "safety_lockout" add constraint "safety_lockout_primary_id_foreign" foreign key ("primary_id") references "app_user" ("id") on update cascade;`);
    this.addSql(`alter table "safety_lockout" add constraint "safety_lockout_pending_handover_to_id_foreign" foreign key ("pending_handover_to_id") references "app_user" ("id") on update cascade on delete set null;`);

    this.addSql(`alter table "safety_lockout_point" add constraint "safety_lockout_point_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "safety_lockout_point" add constraint "safety_lockout_point_session_id_foreign" foreign key ("session_id") references "safety_lockout" ("id") on update cascade;`);
    this.addSql(`alter table "safety_lockout_point" add constraint "safety_lockout_point_applied_by_id_foreign" foreign key ("applied_by_id") references "app_user" ("id") on update cascade;`);
    this.addSql(`alter table "safety_lockout_point" add constraint "safety_lockout_point_holder_id_foreign" foreign key ("holder_id") references "app_user" ("id") on update cascade;`);
    this.addSql(`alter table "safety_lockout_point" add constraint "safety_lockout_point_removed_by_id_foreign" foreign key ("removed_by_id") references "app_user" ("id") on update cascade on delete set null;`);

    this.addSql(`alter table "safety_lockout_member" add constraint "safety_lockout_member_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "safety_lockout_member" add constraint "safety_lockout_member_session_id_foreign" foreign key ("session_id") references "safety_lockout" ("id") on update cascade;`);
    this.addSql(`alter table "safety_lockout_member" add constraint "safety_lockout_member_user_id_foreign" foreign key ("user_id") references "app_user" ("id") on update cascade;`);

    this.addSql(`alter table "safety_fire_watch" add constraint "safety_fire_watch_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "safety_fire_watch" add constraint "safety_fire_watch_machine_id_foreign" foreign key ("machine_id") references "machine" ("id") on update cascade on delete no action;`);
    this.addSql(`alter table "safety_fire_watch" add constraint "safety_fire_watch_watcher_id_foreign" foreign key ("watcher_id") references "app_user" ("id") on update cascade;`);
    this.addSql(`alter table "safety_fire_watch" add constraint "safety_fire_watch_start_sign_off_id_foreign" foreign key ("start_sign_off_id") references "safety_sign_off" ("id") on update cascade on delete no action;`);
    this.addSql(`alter table "safety_fire_watch" add constraint "safety_fire_watch_end_sign_off_id_foreign" foreign key ("end_sign_off_id") references "safety_sign_off" ("id") on update cascade on delete no action;`);
    // Append-only safety log. The app role owns its tables, so a REVOKE would not bind it;
    // these triggers refuse UPDATE, DELETE and TRUNCATE for every role that does not disable them.
    this.addSql(`create or replace function safety_sign_off_append_only() returns trigger language plpgsql as $$
begin
  raise exception 'safety_sign_off is append-only: % is not allowed; record a correction instead', tg_op
    using errcode = 'P0001';
end;
$$;`);
    this.addSql(`create trigger safety_sign_off_no_change before update or delete on "safety_sign_off" for each row execute function safety_sign_off_append_only();`);
    this.addSql(`create trigger safety_sign_off_no_truncate before truncate on "safety_sign_off" for each statement execute function safety_sign_off_append_only();`);
  }

  override async down(): Promise<void> {
    this.addSql(`alter table "safety_training" drop constraint "safety_training_procedure_id_foreign";`);

    this.addSql(`alter table "safety_procedure_version" drop constraint "safety_procedure_version_procedure_id_foreign";`);

    this.addSql(`alter table "safety_inspection" drop constraint "safety_inspection_procedure_id_foreign";`);

    this.addSql(`alter table "safety_lockout" drop constraint "safety_lockout_procedure_id_foreign";`);

    this.addSql(`alter table "safety_ppe_check" drop constraint "safety_ppe_check_requirement_id_foreign";`);

    this.addSql(`alter table "safety_sign_off" drop constraint "safety_sign_off_corrects_id_foreign";`);

    this.addSql(`alter table "safety_training" drop constraint "safety_training_sign_off_id_foreign";`);

    this.addSql(`alter table "safety_procedure_version" drop constraint "safety_procedure_version_approval_sign_off_id_foreign";`);

    this.addSql(`alter table "safety_ppe_check" drop constraint "safety_ppe_check_sign_off_id_foreign";`);

    this.addSql(`alter table "safety_inspection" drop constraint "safety_inspection_performed_sign_off_id_foreign";`);

    this.addSql(`alter table "safety_inspection" drop constraint "safety_inspection_certify_sign_off_id_foreign";`);

    this.addSql(`alter table "safety_fire_watch" drop constraint "safety_fire_watch_start_sign_off_id_foreign";`);

    this.addSql(`alter table "safety_fire_watch" drop constraint "safety_fire_watch_end_sign_off_id_foreign";`);

    this.addSql(`alter table "safety_procedure_photo" drop constraint "safety_procedure_photo_version_id_foreign";`);

    this.addSql(`alter table "safety_lockout" drop constraint "safety_lockout_procedure_version_id_foreign";`);

    this.addSql(`alter table "safety_lockout_point" drop constraint "safety_lockout_point_session_id_foreign";`);

    this.addSql(`alter table "safety_lockout_member" drop constraint "safety_lockout_member_session_id_foreign";`);

    this.addSql(`drop table if exists "safety_procedure" cascade;`);

    this.addSql(`drop table if exists "safety_ppe_requirement" cascade;`);

    this.addSql(`drop table if exists "safety_chain_head" cascade;`);

    this.addSql(`drop table if exists "safety_task" cascade;`);

    this.addSql(`drop table if exists "safety_sign_off" cascade;`);
    this.addSql(`drop function if exists safety_sign_off_append_only();`);

    this.addSql(`drop table if exists "safety_training" cascade;`);

    this.addSql(`drop table if exists "safety_procedure_version" cascade;`);

    this.addSql(`drop table if exists "safety_procedure_photo" cascade;`);

    this.addSql(`drop table if exists "safety_ppe_check" cascade;`);

    this.addSql(`drop table if exists "safety_inspection" cascade;`);

    this.addSql(`drop table if exists "safety_lockout" cascade;`);

    this.addSql(`drop table if exists "safety_lockout_point" cascade;`);

    this.addSql(`drop table if exists "safety_lockout_member" cascade;`);

    this.addSql(`drop table if exists "safety_fire_watch" cascade;`);
  }

}
