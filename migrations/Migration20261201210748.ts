import { Migration } from '@mikro-orm/migrations';

export class Migration20261201210748 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table "part_type" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "part_number" varchar(60) not null, "name" varchar(160) not null, "category" text check ("category" in ('electrode', 'nozzle', 'swirl-ring', 'shield', 'retaining-cap', 'punch', 'die', 'stripper', 'hydraulic-filter', 'extractor-cartridge', 'oil', 'grease', 'other')) not null, "stock_unit" varchar(16) not null default 'pcs', "life_unit" text check ("life_unit" in ('starts', 'arc-hours', 'hits', 'hours', 'days')) null, "expected_life" double precision null, "unit_cost" numeric(12,2) not null default 0, "on_hand" double precision not null default 0, "lead_time_days" int not null default 7, "service_level" double precision not null default 0.95, "active" boolean not null default true, constraint "part_type_pkey" primary key ("id"));`);
    this.addSql(`alter table "part_type" add constraint "part_type_organization_id_part_number_unique" unique ("organization_id", "part_number");`);

    this.addSql(`create table "stock_move" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "part_type_id" uuid not null, "kind" text check ("kind" in ('received', 'used', 'adjusted')) not null, "quantity" double precision not null, "on_hand_after" double precision not null, "reason" varchar(300) null, "by_id" uuid null, "ref_type" varchar(60) null, "ref_id" uuid null, constraint "stock_move_pkey" primary key ("id"));`);
    this.addSql(`create index "stock_move_part_type_id_created_at_index" on "stock_move" ("part_type_id", "created_at");`);

    this.addSql(`alter table "part_type" add constraint "part_type_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);

    this.addSql(`alter table "stock_move" add constraint "stock_move_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "stock_move" add constraint "stock_move_part_type_id_foreign" foreign key ("part_type_id") references "part_type" ("id") on update cascade;`);
    this.addSql(`alter table "stock_move" add constraint "stock_move_by_id_foreign" foreign key ("by_id") references "app_user" ("id") on update cascade on delete set null;`);
  }

  override async down(): Promise<void> {
    this.addSql(`alter table "stock_move" drop constraint "stock_move_part_type_id_foreign";`);

    this.addSql(`drop table if exists "part_type" cascade;`);

    this.addSql(`drop table if exists "stock_move" cascade;`);
  }

}
