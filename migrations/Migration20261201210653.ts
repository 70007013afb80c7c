import { Migration } from '@mikro-orm/migrations';

export class Migration20261201210653 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table "machine" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "parent_id" uuid null, "kind" text check ("kind" in ('punch-plasma-cell', 'plasma-table', 'press-brake', 'hydraulic-unit', 'fume-extractor', 'torch', 'punch-head', 'other')) not null, "code" varchar(40) not null, "name" varchar(120) not null, "location" varchar(120) null, "serial" varchar(80) null, "notes" text null, "active" boolean not null default true, constraint "machine_pkey" primary key ("id"));`);
    this.addSql(`alter table "machine" add constraint "machine_organization_id_code_unique" unique ("organization_id", "code");`);

    this.addSql(`create table "meter" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "machine_id" uuid not null, "code" varchar(40) not null, "name" varchar(120) not null, "kind" text check ("kind" in ('count', 'running-time', 'condition')) not null, "unit" varchar(16) not null, "lower_limit" double precision null, "upper_limit" double precision null, constraint "meter_pkey" primary key ("id"));`);
    this.addSql(`alter table "meter" add constraint "meter_machine_id_code_unique" unique ("machine_id", "code");`);

    this.addSql(`create table "meter_reading" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "meter_id" uuid not null, "value" double precision not null, "read_at" timestamptz not null, "source" text check ("source" in ('manual', 'import', 'work-order', 'consumable-change')) not null, "is_reset" boolean not null default false, "note" varchar(300) null, "recorded_by_id" uuid null, "import_key" varchar(64) null, constraint "meter_reading_pkey" primary key ("id"));`);
    this.addSql(`create index "meter_reading_meter_id_read_at_index" on "meter_reading" ("meter_id", "read_at");`);
    this.addSql(`alter table "meter_reading" add constraint "meter_reading_meter_id_import_key_unique" unique ("meter_id", "import_key");`);

    this.addSql(`alter table "machine" add constraint "machine_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "machine" add constraint "machine_parent_id_foreign" foreign key ("parent_id") references "machine" ("id") on update cascade on delete set null;`);

    this.addSql(`alter table "meter" add constraint "meter_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "meter" add constraint "meter_machine_id_foreign" foreign key ("machine_id") references "machine" ("id") on update cascade;`);

    this.addSql(`alter table "meter_reading" add constraint "meter_reading_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "meter_reading" add constraint "meter_reading_meter_id_foreign" foreign key ("meter_id") references "meter" ("id") on update cascade;`);
    this.addSql(`alter table "meter_reading" add constraint "meter_reading_recorded_by_id_foreign" foreign key ("recorded_by_id") references "app_user" ("id") on update cascade on delete set null;`);
  }

  override async down(): Promise<void> {
    this.addSql(`alter table "machine" drop constraint "machine_parent_id_foreign";`);

    this.addSql(`alter table "meter" drop constraint "meter_machine_id_foreign";`);

    this.addSql(`alter table "meter_reading" drop constraint "meter_reading_meter_id_foreign";`);

    this.addSql(`drop table if exists "machine" cascade;`);

    this.addSql(`drop table if exists "meter" cascade;`);

    this.addSql(`drop table if exists "meter_reading" cascade;`);
  }

}
