import { Migration } from '@mikro-orm/migrations';

export class Migration20261201205756 extends Migration {

  override async up(): Promise<void> {
    // Sessions (connect-pg-simple's own layout); kept out of the schema diff by skipTables.
    this.addSql(`create table "session" ("sid" varchar not null collate "default", "sess" json not null, "expire" timestamp(6) not null, constraint "session_pkey" primary key ("sid"));`);
    this.addSql(`create index "IDX_session_expire" on "session" ("expire");`);

    this.addSql(`create table "organization" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "name" varchar(200) not null, "slug" varchar(80) not null, "time_zone" varchar(64) not null, "settings" jsonb not null default '{}', constraint "organization_pkey" primary key ("id"));`);
    this.addSql(`alter table "organization" add constraint "organization_slug_unique" unique ("slug");`);

    this.addSql(`create table "outbox_mail" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid null, "to_address" varchar(254) not null, "subject" varchar(300) not null, "text_body" text not null, "html_body" text null, "kind" varchar(60) not null, "status" text check ("status" in ('pending', 'sent', 'failed')) not null default 'pending', "attempts" int not null default 0, "next_attempt_at" timestamptz not null, "last_error" text null, "sent_at" timestamptz null, "message_id" varchar(300) null, constraint "outbox_mail_pkey" primary key ("id"));`);
    this.addSql(`create index "outbox_mail_status_next_attempt_at_index" on "outbox_mail" ("status", "next_attempt_at");`);

    this.addSql(`create table "app_user" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "email" varchar(254) not null, "name" varchar(120) not null, "password_hash" varchar(255) null, "last_sign_in_at" timestamptz null, constraint "app_user_pkey" primary key ("id"));`);
    this.addSql(`alter table "app_user" add constraint "app_user_email_unique" unique ("email");`);

    this.addSql(`create table "membership" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "user_id" uuid not null, "organization_id" uuid not null, "role" text check ("role" in ('operator', 'technician', 'safety', 'admin')) not null, "active" boolean not null default true, constraint "membership_pkey" primary key ("id"));`);
    this.addSql(`alter table "membership" add constraint "membership_user_id_organization_id_unique" unique ("user_id", "organization_id");`);

    this.addSql(`create table "audit_event" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "organization_id" uuid not null, "actor_id" uuid null, "action" varchar(80) not null, "entity_type" varchar(80) not null, "entity_id" varchar(80) null, "details" jsonb null, constraint "audit_event_pkey" primary key ("id"));`);
    this.addSql(`create index "audit_event_organization_id_created_at_index" on "audit_event" ("organization_id", "created_at");`);

    this.addSql(`create table "user_token" ("id" uuid not null, "created_at" timestamptz not null, "updated_at" timestamptz not null, "user_id" uuid not null, "purpose" text check ("purpose" in ('invite', 'reset')) not null, "token_hash" varchar(64) not null, "expires_at" timestamptz not null, "used_at" timestamptz null, constraint "user_token_pkey" primary key ("id"));`);
    this.addSql(`alter table "user_token" add constraint "user_token_token_hash_unique" unique ("token_hash");`);

    this.addSql(`alter table "membership" add constraint "membership_user_id_foreign" foreign key ("user_id") references "app_user" ("id") on update cascade;`);
    this.addSql(`alter table "membership" add constraint "membership_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);

    this.addSql(`alter table "audit_event" add constraint "audit_event_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`);
    this.addSql(`alter table "audit_event" add constraint "audit_event_actor_id_foreign" foreign key ("actor_id") references "app_user" ("id") on update cascade on delete set null;`);

    this.addSql(`alter table "user_token" add constraint "user_token_user_id_foreign" foreign key ("user_id") references "app_user" ("id") on update cascade;`);
  }

}
