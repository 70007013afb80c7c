import { Migration } from '@mikro-orm/migrations';

export class Migration20261205181001 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create index "work_order_list_due_index" on "work_order" ("organization_id", "due_at", "number" desc);`);
  }

  override async down(): Promise<void> {
    this.addSql(`drop index if exists "work_order_list_due_index";`);
  }

}
