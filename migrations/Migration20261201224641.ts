import { Migration } from '@mikro-orm/migrations';

export class Migration20261201224641 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table "machine_photo" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "machine_id" uuid not null, "caption" varchar(200) null, "mime_type" varchar(40) not null, "byte_size" int not null, "data" bytea not null, "uploaded_by_id" uuid null, constraint "machine_photo_pkey" primary key ("id"));`);
    this.addSql(`create index "machine_photo_machine_id_index" on "machine_photo" ("machine_id");`);

    this.addSql(`alter table "machine_photo" add constraint "machine_photo_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "machine_photo" add constraint "machine_photo_machine_id_foreign" foreign key ("machine_id") references "machine" ("id") on update cascade;`);
    this.addSql(`alter table "machine_photo" add constraint "machine_photo_uploaded_by_id_foreign" foreign key ("uploaded_by_id") references "app_user" ("id") on update cascade on delete set null;`);
  }

  override async down(): Promise<void> {
    this.addSql(`drop table if exists "machine_photo" cascade;`);
  }

}
