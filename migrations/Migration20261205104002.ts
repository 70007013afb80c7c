import { Migration } from '@mikro-orm/migrations';

export class Migration20261205104002 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table "supplier" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "name" varchar(120) not null, "email" varchar(254) null, "phone" varchar(40) null, "note" varchar(300) null, constraint "supplier_pkey" primary key ("id"));`);
    this.addSql(`alter table "supplier" add constraint "supplier_organization_id_name_unique" unique ("organization_id", "name");`);

    this.addSql(`create table "purchase_request" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "number" int not null, "part_type_id" uuid not null, "supplier_id" uuid null, "status" text check ("status" in ('requested', 'approved', 'ordered', 'received', 'cancelled')) not null, "quantity" double precision not null, "received" double precision not null default 0, "note" varchar(300) null, "requested_by_id" uuid null, "approved_by_id" uuid null, "approved_at" timestamptz null, "ordered_by_id" uuid null, "ordered_at" timestamptz null, "closed_at" timestamptz null, constraint "purchase_request_pkey" primary key ("id"));`);
    this.addSql(`create index "purchase_request_part_type_id_status_index" on "purchase_request" ("part_type_id", "status");`);
    this.addSql(`alter table "purchase_request" add constraint "purchase_request_organization_id_number_unique" unique ("organization_id", "number");`);

    this.addSql(`create table "purchase_receipt" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "request_id" uuid not null, "quantity" double precision not null, "received_at" timestamptz not null, "by_id" uuid null, "note" varchar(300) null, constraint "purchase_receipt_pkey" primary key ("id"));`);

    this.addSql(`alter table "supplier" add constraint "supplier_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);

    this.addSql(`alter table "purchase_request" add constraint "purchase_request_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "purchase_request" add constraint "purchase_request_part_type_id_foreign" foreign key ("part_type_id") references "part_type" ("id") on update cascade;`);
    this.addSql(`alter table "purchase_request" add constraint "purchase_request_supplier_id_foreign" foreign key ("supplier_id") references "supplier" ("id") on update cascade on delete set null;`);
    this.addSql(`alter table "purchase_request" add constraint "purchase_request_requested_by_id_foreign" foreign key ("requested_by_id") references "app_user" ("id") on update cascade on delete set null;`);
    this.addSql(`alter table "purchase_request" add constraint "purchase_request_approved_by_id_foreign" foreign key ("approved_by_id") references "app_user" ("id") on update cascade on delete set null;`);
    this.addSql(`alter table "purchase_request" add constraint "purchase_request_ordered_by_id_foreign" foreign key ("ordered_by_id") references "app_user" ("id") on update cascade on delete set null;`);

    this.addSql(`alter table "purchase_receipt" add constraint "purchase_receipt_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "purchase_receipt" add constraint "purchase_receipt_request_id_foreign" foreign key ("request_id") references "purchase_request" ("id") on update cascade;`);
    this.addSql(`alter table "purchase_receipt" add constraint "purchase_receipt_by_id_foreign" foreign key ("by_id") references "app_user" ("id") on update cascade on delete set null;`);

    this.addSql(`alter table "part_type" add column "lead_time_sd_days" double precision not null default 0, add column "supplier_id" uuid null, add column "pack_size" int not null default 1, add column "min_order_qty" double precision not null default 0;`);
    this.addSql(`alter table "part_type" add constraint "part_type_supplier_id_foreign" foreign key ("supplier_id") references "supplier" ("id") on update cascade on delete set null;`);
  }

  override async down(): Promise<void> {
    this.addSql(`alter table "part_type" drop constraint "part_type_supplier_id_foreign";`);

    this.addSql(`alter table "purchase_request" drop constraint "purchase_request_supplier_id_foreign";`);

    this.addSql(`alter table "purchase_receipt" drop constraint "purchase_receipt_request_id_foreign";`);

    this.addSql(`drop table if exists "supplier" cascade;`);

    this.addSql(`drop table if exists "purchase_request" cascade;`);

    this.addSql(`drop table if exists "purchase_receipt" cascade;`);

    this.addSql(`alter table "part_type" drop column "lead_time_sd_days", drop column "supplier_id", drop column "pack_size", drop column "min_order_qty";`);
  }

}
