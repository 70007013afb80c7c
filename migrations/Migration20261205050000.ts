import { Migration } from '@mikro-orm/migrations';

export class Migration20261205050000 extends Migration {

  override async up(): Promise<void> {
    // Every outbox row gets its Message-ID when queued; rows queued before keep the id their
    // send recorded, or get one from their own uuid.
    this.addSql(`update "outbox_mail" set "message_id" = '<' || "id" || '@kerfbook.example>' where "message_id" is null;`);
    this.addSql(`alter table "outbox_mail" alter column "message_id" set not null;`);
    this.addSql(`alter table "outbox_mail" add constraint "outbox_mail_message_id_unique" unique ("message_id");`);
  }

  override async down(): Promise<void> {
    this.addSql(`alter table "outbox_mail" drop constraint "outbox_mail_message_id_unique";`);
    this.addSql(`alter table "outbox_mail" alter column "message_id" drop not null;`);
  }

}
