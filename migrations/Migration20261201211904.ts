import { Migration } from '@mikro-orm/migrations';

export class Migration20261201211904 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`alter table "maintenance_plan" add column "recheck_at" timestamptz null, add column "inputs_at" timestamptz null;`);

    this.addSql(`alter table "job_run" add column "plans_checked" int not null default 0;`);
  }

  override async down(): Promise<void> {
    this.addSql(`alter table "job_run" drop column "plans_checked";`);

    this.addSql(`alter table "maintenance_plan" drop column "recheck_at", drop column "inputs_at";`);
  }

}
