import { Migration } from '@mikro-orm/migrations';

/**
 * Counter readings: one index instead of two. The import key is a SHA-256 of meter, time,
 * value and reset, so two readings with the same key have the same time; a unique
 * (meter, time, key) index keeps imports idempotent exactly as the unique (meter, key) did,
 * and also serves every lookup of a meter's readings by time. The key is kept as its 32
 * bytes rather than 64 hex characters.
 */
export class Migration20261205180001 extends Migration {
  override async up(): Promise<void> {
    this.addSql(`alter table "meter_reading" drop constraint "meter_reading_meter_id_import_key_unique";`);
    this.addSql(`drop index "meter_reading_meter_id_read_at_index";`);
    this.addSql(`alter table "meter_reading" alter column "import_key" type bytea using decode("import_key", 'hex');`);
    this.addSql(
      `alter table "meter_reading" add constraint "meter_reading_meter_id_read_at_import_key_unique" unique ("meter_id", "read_at", "import_key");`,
    );
  }

  override async down(): Promise<void> {
    this.addSql(`alter table "meter_reading" drop constraint "meter_reading_meter_id_read_at_import_key_unique";`);
    this.addSql(`alter table "meter_reading" alter column "import_key" type varchar(64) using encode("import_key", 'hex');`);
    this.addSql(`create index "meter_reading_meter_id_read_at_index" on "meter_reading" ("meter_id", "read_at");`);
    this.addSql(`alter table "meter_reading" add constraint "meter_reading_meter_id_import_key_unique" unique ("meter_id", "import_key");`);
  }
}
