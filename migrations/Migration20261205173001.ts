import { Migration } from '@mikro-orm/migrations';

/**
 * A shop's revision: every statement that writes a shop's rows adds a row to `shop_change` for
 * that shop, from statement-level triggers on every table with an `organization_id` (plus the
 * shop itself and its people's names). The sum of a shop's weights grows with every committed
 * write and never otherwise, so a page computed after reading it is current for as long as the
 * sum stays the same (server/modules/shop-changes). Compaction folds rows into one of the same
 * total weight. Bookkeeping that no page shows (idempotency keys) is left out.
 */
export class Migration20261205173001 extends Migration {
  override async up(): Promise<void> {
    this.addSql(`create table "shop_change" ("id" bigint generated always as identity primary key, "organization_id" uuid not null, "weight" bigint not null default 1);`);
    this.addSql(`create index "shop_change_organization_id_index" on "shop_change" ("organization_id");`);

    this.addSql(`create function shop_change_from_new() returns trigger language plpgsql as $$
begin
  insert into shop_change (organization_id) select distinct organization_id from shop_change_new where organization_id is not null;
  return null;
end $$;`);
    this.addSql(`create function shop_change_from_old() returns trigger language plpgsql as $$
begin
  insert into shop_change (organization_id) select distinct organization_id from shop_change_old where organization_id is not null;
  return null;
end $$;`);
    this.addSql(`create function shop_change_from_shop() returns trigger language plpgsql as $$
begin
  insert into shop_change (organization_id) select id from shop_change_new;
  return null;
end $$;`);
    // A person's name is shown on every shop page that names them (changed by, held by).
    this.addSql(`create function shop_change_from_person() returns trigger language plpgsql as $$
begin
  insert into shop_change (organization_id)
    select distinct m.organization_id from membership m join shop_change_new u on u.id = m.user_id;
  return null;
end $$;`);

    // Later migrations call this for each new shop table; tests/server/shop-revision.test.ts checks none is missed.
    this.addSql(`create function attach_shop_change_triggers(t regclass) returns void language plpgsql as $$
begin
  execute format('create trigger shop_change_insert after insert on %s referencing new table as shop_change_new for each statement execute function shop_change_from_new()', t);
  execute format('create trigger shop_change_update after update on %s referencing new table as shop_change_new for each statement execute function shop_change_from_new()', t);
  execute format('create trigger shop_change_delete after delete on %s referencing old table as shop_change_old for each statement execute function shop_change_from_old()', t);
end $$;`);

    this.addSql(`do $$
declare t text;
begin
  for t in select c.table_name from information_schema.columns c join information_schema.tables tb using (table_schema, table_name)
            where c.table_schema = 'public' and c.column_name = 'organization_id' and tb.table_type = 'BASE TABLE'
              and c.table_name not in ('shop_change', 'idempotency_key')
  loop
    perform attach_shop_change_triggers(format('%I', t)::regclass);
  end loop;
end $$;`);
    this.addSql(
      `create trigger shop_change_update after update on "organization" referencing new table as shop_change_new for each statement execute function shop_change_from_shop();`,
    );
    this.addSql(
      `create trigger shop_change_update after update on "app_user" referencing new table as shop_change_new for each statement execute function shop_change_from_person();`,
    );
  }

  override async down(): Promise<void> {
    this.addSql(`do $$
declare r record;
begin
  for r in select tgrelid::regclass as t, tgname from pg_trigger where tgname like 'shop_change_%' and not tgisinternal loop
    execute format('drop trigger %I on %s', r.tgname, r.t);
  end loop;
end $$;`);
    this.addSql(`drop function if exists attach_shop_change_triggers(regclass);`);
    this.addSql(`drop function if exists shop_change_from_new(), shop_change_from_old(), shop_change_from_shop(), shop_change_from_person();`);
    this.addSql(`drop table if exists "shop_change";`);
  }
}
