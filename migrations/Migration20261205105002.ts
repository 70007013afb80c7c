import { Migration } from '@mikro-orm/migrations';

export class Migration20261205105002 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table "light_curtain_check" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "machine_id" uuid not null, "stopping_time_ms" double precision not null, "detection_capability_mm" double precision not null, "measured_distance_mm" double precision not null, "required_distance_mm" int not null, "approach_speed_mm_s" int not null, "pass" boolean not null, "note" varchar(500) null, "checked_at" timestamptz not null, "checked_by_id" uuid not null, "downtime_id" uuid null, constraint "light_curtain_check_pkey" primary key ("id"));`);
    this.addSql(`create index "light_curtain_check_machine_id_checked_at_index" on "light_curtain_check" ("machine_id", "checked_at");`);

    this.addSql(`alter table "light_curtain_check" add constraint "light_curtain_check_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "light_curtain_check" add constraint "light_curtain_check_machine_id_foreign" foreign key ("machine_id") references "machine" ("id") on update cascade;`);
    this.addSql(`alter table "light_curtain_check" add constraint "light_curtain_check_checked_by_id_foreign" foreign key ("checked_by_id") references "app_user" ("id") on update cascade;`);
    this.addSql(`alter table "light_curtain_check" add constraint "light_curtain_check_downtime_id_foreign" foreign key ("downtime_id") references "machine_downtime" ("id") on update cascade on delete set null;`);
  }

  override async down(): Promise<void> {
    this.addSql(`drop table if exists "light_curtain_check" cascade;`);
  }

}
