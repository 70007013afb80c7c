import { Migration } from '@mikro-orm/migrations';

export class Migration20261205106001 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`alter table "maintenance_plan" add column "station_record" jsonb null;`);

    this.addSql(`alter table "work_order" add column "station_record_type" varchar(40) null, add column "station_record_id" uuid null, add column "station_record_summary" varchar(300) null;`);
    this.addSql(`create index "work_order_station_record_id_index" on "work_order" ("station_record_id");`);
  }

  override async down(): Promise<void> {
    this.addSql(`alter table "maintenance_plan" drop column "station_record";`);

    this.addSql(`drop index "work_order_station_record_id_index";`);
    this.addSql(`alter table "work_order" drop column "station_record_type", drop column "station_record_id", drop column "station_record_summary";`);
  }

}
