import { Migration } from '@mikro-orm/migrations';

export class Migration20261205102001 extends Migration {

  override async up(): Promise<void> {
    this.addSql(`create table "safety_chain_copy" ("id" uuid not null, "organization_id" uuid not null, "seq" int not null, "hash" varchar(64) not null, "made_at" timestamptz not null, "via" text check ("via" in ('mail', 'export')) not null, "made_by_id" uuid null, "local_date" varchar(10) null, "signature" varchar(64) not null, constraint "safety_chain_copy_pkey" primary key ("id"));`);
    this.addSql(`create index "safety_chain_copy_organization_id_made_at_index" on "safety_chain_copy" ("organization_id", "made_at");`);

    this.addSql(`create table "idempotency_key" ("id" uuid not null, "organization_id" uuid not null, "user_id" uuid not null, "key" varchar(200) not null, "endpoint" varchar(300) not null, "request_hash" varchar(64) not null, "status_code" int null, "response_body" jsonb null, "created_at" timestamptz not null, "expires_at" timestamptz not null, constraint "idempotency_key_pkey" primary key ("id"));`);
    this.addSql(`create index "idempotency_key_expires_at_index" on "idempotency_key" ("expires_at");`);
    this.addSql(`alter table "idempotency_key" add constraint "idempotency_key_organization_id_user_id_key_unique" unique ("organization_id", "user_id", "key");`);

    this.addSql(`alter table "safety_chain_copy" add constraint "safety_chain_copy_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update no action on delete no action;`);
    this.addSql(`alter table "safety_chain_copy" add constraint "safety_chain_copy_made_by_id_foreign" foreign key ("made_by_id") references "app_user" ("id") on update no action on delete no action;`);

    this.addSql(`alter table "idempotency_key" add constraint "idempotency_key_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade on delete cascade;`);
    this.addSql(`alter table "idempotency_key" add constraint "idempotency_key_user_id_foreign" foreign key ("user_id") references "app_user" ("id") on update cascade on delete cascade;`);

    // The record of chain-head copies is append-only, like the sign-offs it vouches for.
    this.addSql(`create or replace function safety_chain_copy_append_only() returns trigger language plpgsql as $$
begin
  raise exception 'safety_chain_copy is append-only: % is not allowed', tg_op;
end $$;`);
    this.addSql(`create trigger safety_chain_copy_no_change before update or delete on "safety_chain_copy" for each row execute function safety_chain_copy_append_only();`);
    this.addSql(`create trigger safety_chain_copy_no_truncate before truncate on "safety_chain_copy" for each statement execute function safety_chain_copy_append_only();`);
  }

  override async down(): Promise<void> {
    this.addSql(`drop table if exists "safety_chain_copy" cascade;`);
    this.addSql(`drop function if exists safety_chain_copy_append_only();`);

    this.addSql(`drop table if exists "idempotency_key" cascade;`);
  }

}
