import { Migration } from '@mikro-orm/migrations';

export class Migration20261205105001 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table "failure_code" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "category" text check ("category" in ('mode', 'cause', 'remedy')) not null, "code" varchar(12) not null, "label" varchar(120) not null, "active" boolean not null default true, constraint "failure_code_pkey" primary key ("id"));`);
    this.addSql(`alter table "failure_code" add constraint "failure_code_organization_id_category_code_unique" unique ("organization_id", "category", "code");`);

    this.addSql(`create table "machine_downtime" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "machine_id" uuid not null, "kind" text check ("kind" in ('failure', 'planned')) not null, "reason" varchar(500) not null, "failure_code" varchar(12) null, "cause_code" varchar(12) null, "remedy_code" varchar(12) null, "work_order_id" uuid null, "started_at" timestamptz not null, "started_by_id" uuid null, "ended_at" timestamptz null, "ended_by_id" uuid null, "ended_by_work_order_id" uuid null, constraint "machine_downtime_pkey" primary key ("id"));`);
    this.addSql(`create index "machine_downtime_organization_id_started_at_index" on "machine_downtime" ("organization_id", "started_at");`);
    this.addSql(`create index "machine_downtime_machine_id_started_at_index" on "machine_downtime" ("machine_id", "started_at");`);
    this.addSql(`create unique index "machine_downtime_one_open_index" on "machine_downtime" ("machine_id") where "ended_at" is null;`);

    this.addSql(`create table "machine_state_change" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "machine_id" uuid not null, "from_state" text check ("from_state" in ('in-service', 'out-of-service', 'locked-out')) not null, "to_state" text check ("to_state" in ('in-service', 'out-of-service', 'locked-out')) not null, "at" timestamptz not null, "by_id" uuid null, "reason" varchar(500) null, "downtime_id" uuid null, "work_order_id" uuid null, constraint "machine_state_change_pkey" primary key ("id"));`);
    this.addSql(`create index "machine_state_change_machine_id_at_index" on "machine_state_change" ("machine_id", "at");`);

    this.addSql(`alter table "failure_code" add constraint "failure_code_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);

    this.addSql(`alter table "machine_downtime" add constraint "machine_downtime_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "machine_downtime" add constraint "machine_downtime_machine_id_foreign" foreign key ("machine_id") references "machine" ("id") on update cascade;`);
    this.addSql(`alter table "machine_downtime" add constraint "machine_downtime_started_by_id_foreign" foreign key ("started_by_id") references "app_user" ("id") on update cascade on delete set null;`);
    this.addSql(`alter table "machine_downtime" add constraint "machine_downtime_ended_by_id_foreign" foreign key ("ended_by_id") references "app_user" ("id") on update cascade on delete set null;`);

    this.addSql(`alter table "machine_state_change" add constraint "machine_state_change_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "machine_state_change" add constraint "machine_state_change_machine_id_foreign" foreign key ("machine_id") references "machine" ("id") on update cascade;`);
    this.addSql(`alter table "machine_state_change" add constraint "machine_state_change_by_id_foreign" foreign key ("by_id") references "app_user" ("id") on update cascade on delete set null;`);
    this.addSql(`alter table "machine_state_change" add constraint "machine_state_change_downtime_id_foreign" foreign key ("downtime_id") references "machine_downtime" ("id") on update cascade on delete set null;`);
  }

  override async down(): Promise<void> {
    this.addSql(`alter table "machine_state_change" drop constraint "machine_state_change_downtime_id_foreign";`);

    this.addSql(`drop table if exists "failure_code" cascade;`);

    this.addSql(`drop table if exists "machine_downtime" cascade;`);

    this.addSql(`drop table if exists "machine_state_change" cascade;`);
  }

}
