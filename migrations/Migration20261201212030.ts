import { Migration } from '@mikro-orm/migrations';

export class Migration20261201212030 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table "punch_tool" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "machine_id" uuid not null, "hits_meter_id" uuid not null, "code" varchar(40) not null, "name" varchar(120) not null, "station_size" text check ("station_size" in ('A', 'B', 'C', 'D', 'E')) not null, "sharpening_interval_hits" int not null, "hits_at_last_sharpening" double precision not null, "last_sharpened_at" timestamptz null, "active" boolean not null default true, constraint "punch_tool_pkey" primary key ("id"));`);
    this.addSql(`alter table "punch_tool" add constraint "punch_tool_organization_id_code_unique" unique ("organization_id", "code");`);

    this.addSql(`create table "tool_sharpening" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "tool_id" uuid not null, "sharpened_at" timestamptz not null, "hits_reading" double precision not null, "hits_since_previous" double precision not null, "removed_mm" double precision null, "by_id" uuid null, "note" varchar(300) null, constraint "tool_sharpening_pkey" primary key ("id"));`);
    this.addSql(`create index "tool_sharpening_tool_id_sharpened_at_index" on "tool_sharpening" ("tool_id", "sharpened_at");`);

    this.addSql(`create table "cut_check" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "torch_id" uuid not null, "checked_at" timestamptz not null, "tolerance_mm" double precision not null, "dimensions" jsonb not null, "max_deviation_mm" double precision not null, "passed" boolean not null, "install_ids" jsonb not null, "by_id" uuid null, "note" varchar(500) null, constraint "cut_check_pkey" primary key ("id"));`);
    this.addSql(`create index "cut_check_torch_id_checked_at_index" on "cut_check" ("torch_id", "checked_at");`);

    this.addSql(`create table "consumable_change" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "torch_id" uuid not null, "changed_at" timestamptz not null, "reason" text check ("reason" in ('normal-wear', 'failed-start', 'poor-cut', 'damaged', 'preventive')) not null, "starts_reading" double precision null, "arc_hours_reading" double precision null, "pit_depth_mm" double precision null, "note" varchar(500) null, "by_id" uuid null, constraint "consumable_change_pkey" primary key ("id"));`);
    this.addSql(`create index "consumable_change_torch_id_changed_at_index" on "consumable_change" ("torch_id", "changed_at");`);

    this.addSql(`create table "consumable_photo" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "change_id" uuid not null, "mime_type" varchar(40) not null, "byte_size" int not null, "data" bytea not null, constraint "consumable_photo_pkey" primary key ("id"));`);
    this.addSql(`alter table "consumable_photo" add constraint "consumable_photo_change_id_unique" unique ("change_id");`);

    this.addSql(`create table "consumable_install" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "torch_id" uuid not null, "part_type_id" uuid not null, "category" text check ("category" in ('electrode', 'swirl-ring', 'nozzle', 'retaining-cap', 'shield')) not null, "installed_at" timestamptz not null, "install_change_id" uuid null, "starts_at_install" double precision null, "arc_hours_at_install" double precision null, "removed_at" timestamptz null, "removal_change_id" uuid null, "removal_reason" text check ("removal_reason" in ('normal-wear', 'failed-start', 'poor-cut', 'damaged', 'preventive')) null, "life_starts" double precision null, "life_arc_hours" double precision null, constraint "consumable_install_pkey" primary key ("id"));`);
    this.addSql(`create index "consumable_install_torch_id_removed_at_index" on "consumable_install" ("torch_id", "removed_at");`);
    this.addSql(`create index "consumable_install_part_type_id_removed_at_index" on "consumable_install" ("part_type_id", "removed_at");`);

    this.addSql(`alter table "punch_tool" add constraint "punch_tool_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "punch_tool" add constraint "punch_tool_machine_id_foreign" foreign key ("machine_id") references "machine" ("id") on update cascade;`);
    this.addSql(`alter table "punch_tool" add constraint "punch_tool_hits_meter_id_foreign" foreign key ("hits_meter_id") references "meter" ("id") on update cascade;`);

    this.addSql(`alter table "tool_sharpening" add constraint "tool_sharpening_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "tool_sharpening" add constraint "tool_sharpening_tool_id_foreign" foreign key ("tool_id") references "punch_tool" ("id") on update cascade;`);
    this.addSql(`alter table "tool_sharpening" add constraint "tool_sharpening_by_id_foreign" foreign key ("by_id") references "app_user" ("id") on update cascade on delete set null;`);

    this.addSql(`alter table "cut_check" add constraint "cut_check_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "cut_check" add constraint "cut_check_torch_id_foreign" foreign key ("torch_id") references "machine" ("id") on update cascade;`);
    this.addSql(`alter table "cut_check" add constraint "cut_check_by_id_foreign" foreign key ("by_id") references "app_user" ("id") on update cascade on delete set null;`);

    this.addSql(`alter table "consumable_change" add constraint "consumable_change_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "consumable_change" add constraint "consumable_change_torch_id_foreign" foreign key ("torch_id") references "machine" ("id") on update cascade;`);
    this.addSql(`alter table "consumable_change" add constraint "consumable_change_by_id_foreign" foreign key ("by_id") references "app_user" ("id") on update cascade on delete set null;`);

    this.addSql(`alter table "consumable_photo" add constraint "consumable_photo_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "consumable_photo" add constraint "consumable_photo_change_id_foreign" foreign key ("change_id") references "consumable_change" ("id") on update cascade;`);

    this.addSql(`alter table "consumable_install" add constraint "consumable_install_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "consumable_install" add constraint "consumable_install_torch_id_foreign" foreign key ("torch_id") references "machine" ("id") on update cascade;`);
    this.addSql(`alter table "consumable_install" add constraint "consumable_install_part_type_id_foreign" foreign key ("part_type_id") references "part_type" ("id") on update cascade;`);
    this.addSql(`alter table "consumable_install" add constraint "consumable_install_install_change_id_foreign" foreign key ("install_change_id") references "consumable_change" ("id") on update cascade on delete set null;`);
    this.addSql(`alter table "consumable_install" add constraint "consumable_install_removal_change_id_foreign" foreign key ("removal_change_id") references "consumable_change" ("id") on update cascade on delete set null;`);
  }

  override async down(): Promise<void> {
    this.addSql(`alter table "tool_sharpening" drop constraint "tool_sharpening_tool_id_foreign";`);

    this.addSql(`alter table "consumable_photo" drop constraint "consumable_photo_change_id_foreign";`);

    this.addSql(`alter table "consumable_install" drop constraint "consumable_install_install_change_id_foreign";`);

    this.addSql(`alter table "consumable_install" drop constraint "consumable_install_removal_change_id_foreign";`);

    this.addSql(`drop table if exists "punch_tool" cascade;`);

    this.addSql(`drop table if exists "tool_sharpening" cascade;`);

    this.addSql(`drop table if exists "cut_check" cascade;`);

    this.addSql(`drop table if exists "consumable_change" cascade;`);

    this.addSql(`drop table if exists "consumable_photo" cascade;`);

    this.addSql(`drop table if exists "consumable_install" cascade;`);
  }

}
