import { Migration } from '@mikro-orm/migrations';

export class Migration20261201234245 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`alter table "maintenance_plan" add column "status_hash" varchar(40) null;`);
  }

  override async down(): Promise<void> {
    this.addSql(`alter table "maintenance_plan" drop column "status_hash";`);
  }

}
