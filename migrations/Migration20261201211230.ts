import { Migration } from '@mikro-orm/migrations';

export class Migration20261201211230 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table "oil_target" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "machine_id" uuid not null, "target_code" varchar(20) not null, "vg_grade" int not null, "water_limit_ppm" double precision not null, "temperature_limit_c" double precision null, constraint "oil_target_pkey" primary key ("id"));`);
    this.addSql(`alter table "oil_target" add constraint "oil_target_organization_id_machine_id_unique" unique ("organization_id", "machine_id");`);

    this.addSql(`create table "notify_preference" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "user_id" uuid not null, "mode" text check ("mode" in ('immediate', 'daily', 'none')) not null default 'immediate', "digest_hour" int not null default 6, "last_digest_date" varchar(10) null, constraint "notify_preference_pkey" primary key ("id"));`);
    this.addSql(`alter table "notify_preference" add constraint "notify_preference_organization_id_user_id_unique" unique ("organization_id", "user_id");`);

    this.addSql(`create table "maintenance_plan" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "machine_id" uuid not null, "title" varchar(160) not null, "instructions" text not null default '', "checklist" jsonb not null, "estimated_minutes" int null, "parts" jsonb not null, "responsible_role" text check ("responsible_role" in ('operator', 'technician', 'safety', 'admin')) null, "responsible_user_id" uuid null, "requires_lockout" boolean not null default false, "safety_critical" boolean not null default false, "triggers" jsonb not null, "due_soon_days" double precision null, "due_soon_fraction" double precision null, "active" boolean not null default true, "started_at" timestamptz not null, "last_done_at" timestamptz null, "last_raised_key" varchar(200) null, "meter_baselines" jsonb not null, "starter_key" varchar(60) null, "status" text check ("status" in ('not-due', 'due-soon', 'due', 'overdue')) not null default 'not-due', "next_due_at" timestamptz null, "status_reason" text null, "evaluated_at" timestamptz null, "evaluation" jsonb null, constraint "maintenance_plan_pkey" primary key ("id"));`);
    this.addSql(`create index "maintenance_plan_organization_id_machine_id_index" on "maintenance_plan" ("organization_id", "machine_id");`);
    this.addSql(`create index "maintenance_plan_organization_id_status_next_due_at_index" on "maintenance_plan" ("organization_id", "status", "next_due_at");`);

    this.addSql(`create table "job_run" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "pass_id" uuid not null, "trigger" text check ("trigger" in ('schedule', 'manual')) not null, "triggered_by_id" uuid null, "started_at" timestamptz not null, "finished_at" timestamptz null, "plans_evaluated" int not null default 0, "work_orders_raised" int not null default 0, "escalations" int not null default 0, "mails_queued" int not null default 0, "errors" jsonb not null, constraint "job_run_pkey" primary key ("id"));`);
    this.addSql(`create index "job_run_organization_id_started_at_index" on "job_run" ("organization_id", "started_at");`);

    this.addSql(`create table "calendar_feed" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "user_id" uuid not null, "token_hash" varchar(64) not null, "revoked_at" timestamptz null, "last_used_at" timestamptz null, constraint "calendar_feed_pkey" primary key ("id"));`);
    this.addSql(`alter table "calendar_feed" add constraint "calendar_feed_token_hash_unique" unique ("token_hash");`);
    this.addSql(`create index "calendar_feed_organization_id_user_id_index" on "calendar_feed" ("organization_id", "user_id");`);

    this.addSql(`create table "work_order" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "number" int not null, "machine_id" uuid not null, "plan_id" uuid null, "occurrence_key" varchar(200) null, "kind" text check ("kind" in ('scheduled', 'condition', 'corrective')) not null, "title" varchar(160) not null, "instructions" text not null default '', "reason" text null, "status" text check ("status" in ('open', 'in-progress', 'on-hold', 'done', 'cancelled')) not null default 'open', "due_at" timestamptz null, "overdue" boolean not null default false, "escalated_at" timestamptz null, "assignee_id" uuid null, "responsible_role" text check ("responsible_role" in ('operator', 'technician', 'safety', 'admin')) null, "raised_by_id" uuid null, "requires_lockout" boolean not null default false, "safety_critical" boolean not null default false, "lockout_session_id" uuid null, "lockout_released_at" timestamptz null, "checklist" jsonb not null, "planned_parts" jsonb not null, "estimated_minutes" int null, "labour_minutes" int not null default 0, "notes" text not null default '', "started_at" timestamptz null, "hold_reason" varchar(500) null, "completed_at" timestamptz null, "completed_by_id" uuid null, "cancelled_at" timestamptz null, "cancel_reason" varchar(500) null, constraint "work_order_pkey" primary key ("id"));`);
    this.addSql(`create index "work_order_organization_id_status_due_at_index" on "work_order" ("organization_id", "status", "due_at");`);
    this.addSql(`create index "work_order_assignee_id_status_index" on "work_order" ("assignee_id", "status");`);
    this.addSql(`create index "work_order_machine_id_index" on "work_order" ("machine_id");`);
    this.addSql(`alter table "work_order" add constraint "work_order_plan_id_occurrence_key_unique" unique ("plan_id", "occurrence_key");`);
    this.addSql(`alter table "work_order" add constraint "work_order_organization_id_number_unique" unique ("organization_id", "number");`);

    this.addSql(`create table "oil_analysis" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "machine_id" uuid not null, "sampled_at" timestamptz not null, "lab_reference" varchar(80) null, "ge4um" double precision not null, "ge6um" double precision not null, "ge14um" double precision not null, "iso_code" varchar(20) not null, "target_code" varchar(20) null, "viscosity40" double precision null, "vg_grade" int null, "viscosity_band" varchar(20) null, "water_ppm" double precision null, "temperature_c" double precision null, "out_of_limits" boolean not null default false, "findings" jsonb not null, "work_order_id" uuid null, "recorded_by_id" uuid null, "notes" text null, constraint "oil_analysis_pkey" primary key ("id"));`);
    this.addSql(`create index "oil_analysis_machine_id_sampled_at_index" on "oil_analysis" ("machine_id", "sampled_at");`);

    this.addSql(`create table "work_order_attachment" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "work_order_id" uuid not null, "file_name" varchar(200) not null, "mime_type" varchar(60) not null, "size" int not null, "data" bytea not null, "uploaded_by_id" uuid null, constraint "work_order_attachment_pkey" primary key ("id"));`);
    this.addSql(`create index "work_order_attachment_work_order_id_index" on "work_order_attachment" ("work_order_id");`);

    this.addSql(`create table "work_order_counter" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "last_number" int not null default 1000, constraint "work_order_counter_pkey" primary key ("id"));`);
    this.addSql(`alter table "work_order_counter" add constraint "work_order_counter_organization_id_unique" unique ("organization_id");`);

    this.addSql(`create table "work_order_part" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "work_order_id" uuid not null, "part_type_id" uuid not null, "quantity" double precision not null, "stock_move_id" uuid null, "by_id" uuid null, constraint "work_order_part_pkey" primary key ("id"));`);
    this.addSql(`create index "work_order_part_work_order_id_index" on "work_order_part" ("work_order_id");`);

    this.addSql(`alter table "oil_target" add constraint "oil_target_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "oil_target" add constraint "oil_target_machine_id_foreign" foreign key ("machine_id") references "machine" ("id") on update cascade;`);

    this.addSql(`alter table "notify_preference" add constraint "notify_preference_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "notify_preference" add constraint "notify_preference_user_id_foreign" foreign key ("user_id") references "app_user" ("id") on update cascade;`);

    this.addSql(`alter table "maintenance_plan" add constraint "maintenance_plan_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "maintenance_plan" add constraint "maintenance_plan_machine_id_foreign" foreign key ("machine_id") references "machine" ("id") on update cascade;`);
    this.addSql(`alter table "maintenance_plan" add constraint "maintenance_plan_responsible_user_id_foreign" foreign key ("responsible_user_id") references "app_user" ("id") on update cascade on delete set null;`);

    this.addSql(`alter table "job_run" add constraint "job_run_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "job_run" add constraint "job_run_triggered_by_id_foreign" foreign key ("triggered_by_id") references "app_user" ("id") on update cascade on delete set null;`);

    this.addSql(`alter table "calendar_feed" add constraint "calendar_feed_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "calendar_feed" add constraint "calendar_feed_user_id_foreign" foreign key ("user_id") references "app_user" ("id") on update cascade;`);

    this.addSql(`alter table "work_order" add constraint "work_order_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "work_order" add constraint "work_order_machine_id_foreign" foreign key ("machine_id") references "machine" ("id") on update cascade;`);
    this.addSql(`alter table "work_order" add constraint "work_order_plan_id_foreign" foreign key ("plan_id") references "maintenance_plan" ("id") on update cascade on delete set null;`);
    this.addSql(`alter table "work_order" add constraint "work_order_assignee_id_foreign" foreign key ("assignee_id") references "app_user" ("id") on update cascade on delete set null;`);
    this.addSql(`alter table "work_order" add constraint "work_order_raised_by_id_foreign" foreign key ("raised_by_id") references "app_user" ("id") on update cascade on delete set null;`);
    this.addSql(`alter table "work_order" add constraint "work_order_completed_by_id_foreign" foreign key ("completed_by_id") references "app_user" ("id") on update cascade on delete set null;`);

    this.addSql(`alter table "oil_analysis" add constraint "oil_analysis_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "oil_analysis" add constraint "oil_analysis_machine_id_foreign" foreign key ("machine_id") references "machine" ("id") on update cascade;`);
    this.addSql(`alter table "oil_analysis" add constraint "oil_analysis_work_order_id_foreign" foreign key ("work_order_id") references "work_order" ("id") on update cascade on delete set null;`);
    this.addSql(`alter table "oil_analysis" add constraint "oil_analysis_recorded_by_id_foreign" foreign key ("recorded_by_id") references "app_user" ("id") on update cascade on delete set null;`);

    this.addSql(`alter table "work_order_attachment" add constraint "work_order_attachment_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "work_order_attachment" add constraint "work_order_attachment_work_order_id_foreign" foreign key ("work_order_id") references "work_order" ("id") on update cascade;`);
    this.addSql(`alter table "work_order_attachment" add constraint "work_order_attachment_uploaded_by_id_foreign" foreign key ("uploaded_by_id") references "app_user" ("id") on update cascade on delete set null;`);

    this.addSql(`alter table "work_order_counter" add constraint "work_order_counter_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);

    this.addSql(`alter table "work_order_part" add constraint "work_order_part_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "work_order_part" add constraint "work_order_part_work_order_id_foreign" foreign key ("work_order_id") references "work_order" ("id") on update cascade;`);
    this.addSql(`alter table "work_order_part" add constraint "work_order_part_part_type_id_foreign" foreign key ("part_type_id") references "part_type" ("id") on update cascade;`);
    this.addSql(`alter table "work_order_part" add constraint "work_order_part_stock_move_id_foreign" foreign key ("stock_move_id") references "stock_move" ("id") on update cascade on delete set null;`);
    this.addSql(`alter table "work_order_part" add constraint "work_order_part_by_id_foreign" foreign key ("by_id") references "app_user" ("id") on update cascade on delete set null;`);
  }

  override async down(): Promise<void> {
    this.addSql(`alter table "work_order" drop constraint "work_order_plan_id_foreign";`);

    this.addSql(`alter table "oil_analysis" drop constraint "oil_analysis_work_order_id_foreign";`);

    this.addSql(`alter table "work_order_attachment" drop constraint "work_order_attachment_work_order_id_foreign";`);

    this.addSql(`alter table "work_order_part" drop constraint "work_order_part_work_order_id_foreign";`);

    this.addSql(`drop table if exists "oil_target" cascade;`);

    this.addSql(`drop table if exists "notify_preference" cascade;`);

    this.addSql(`drop table if exists "maintenance_plan" cascade;`);

    this.addSql(`drop table if exists "job_run" cascade;`);

    this.addSql(`drop table if exists "calendar_feed" cascade;`);

    this.addSql(`drop table if exists "work_order" cascade;`);

    this.addSql(`drop table if exists "oil_analysis" cascade;`);

    this.addSql(`drop table if exists "work_order_attachment" cascade;`);

    this.addSql(`drop table if exists "work_order_counter" cascade;`);

    this.addSql(`drop table if exists "work_order_part" cascade;`);
  }

}
