import { Migration } from '@mikro-orm/migrations';

export class Migration20261202000015 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`alter table "work_order" add column "notified_at" timestamptz null;`);
    // Work raised before this column existed was notified when it was raised.
    this.addSql(`update "work_order" set "notified_at" = "created_at";`);
    this.addSql(`create index "work_order_unnotified_index" on "work_order" ("organization_id", "number") where "notified_at" is null and "plan_id" is not null;`);
  }

  override async down(): Promise<void> {
    this.addSql(`drop index "work_order_unnotified_index";`);
    this.addSql(`alter table "work_order" drop column "notified_at";`);
  }

}
