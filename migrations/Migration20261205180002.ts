import { Migration } from '@mikro-orm/migrations';

/**
 * Counter readings: the three foreign keys (shop, meter, recorded by) become one check per
 * statement. A foreign key checks each inserted row with a query of its own; a counter import
 * inserts up to a million rows of one shop, a handful of meters and one person, and those
 * per-row checks were a third of its time. The same guarantees, kept by triggers:
 *
 * - a reading's meter exists and belongs to the reading's shop (stronger than before: the shop
 *   itself then exists through the meter's own foreign key), and a named recorder exists —
 *   checked once per INSERT or UPDATE over all its rows, which lock the meters and people they
 *   name (FOR KEY SHARE, as a foreign key does) so neither can be deleted before commit;
 * - a meter with readings cannot be deleted (as before: no action); a meter's new id or shop
 *   carries over to its readings (as before: on update cascade);
 * - a deleted person's readings keep no recorder (as before: on delete set null); a new id
 *   carries over.
 * Raised as SQLSTATE 23503 (foreign_key_violation), as the foreign keys did.
 */
export class Migration20261205180002 extends Migration {
  override async up(): Promise<void> {
    this.addSql(`alter table "meter_reading" drop constraint "meter_reading_organization_id_foreign";`);
    this.addSql(`alter table "meter_reading" drop constraint "meter_reading_meter_id_foreign";`);
    this.addSql(`alter table "meter_reading" drop constraint "meter_reading_recorded_by_id_foreign";`);

    this.addSql(`create or replace function meter_reading_check_references() returns trigger
      language plpgsql security definer set search_path = public as $$
      declare bad record;
      begin
        perform 1 from meter m where m.id in (select distinct n.meter_id from new_rows n) order by m.id for key share;
        perform 1 from app_user u where u.id in (select distinct n.recorded_by_id from new_rows n) order by u.id for key share;
        select n.meter_id, n.organization_id, m.organization_id as meter_organization_id into bad
          from new_rows n left join meter m on m.id = n.meter_id
         where m.id is null or m.organization_id <> n.organization_id limit 1;
        if found then
          raise exception using errcode = 'foreign_key_violation', table = 'meter_reading',
            message = case when bad.meter_organization_id is null then format('meter %s does not exist', bad.meter_id)
                           else format('meter %s belongs to another shop than its reading', bad.meter_id) end;
        end if;
        select n.recorded_by_id into bad from new_rows n
         where n.recorded_by_id is not null and not exists (select 1 from app_user u where u.id = n.recorded_by_id) limit 1;
        if found then
          raise exception using errcode = 'foreign_key_violation', table = 'meter_reading',
            message = format('user %s does not exist', bad.recorded_by_id);
        end if;
        return null;
      end $$;`);
    this.addSql(`create trigger meter_reading_check_references_insert after insert on "meter_reading"
      referencing new table as new_rows for each statement execute function meter_reading_check_references();`);
    this.addSql(`create trigger meter_reading_check_references_update after update on "meter_reading"
      referencing new table as new_rows for each statement execute function meter_reading_check_references();`);

    this.addSql(`create or replace function meter_keeps_its_readings() returns trigger
      language plpgsql security definer set search_path = public as $$
      begin
        if tg_op = 'DELETE' then
          if exists (select 1 from meter_reading r where r.meter_id = old.id) then
            raise exception using errcode = 'foreign_key_violation', table = 'meter',
              message = format('meter %s still has counter readings', old.id);
          end if;
          return old;
        end if;
        if new.id <> old.id or new.organization_id <> old.organization_id then
          update meter_reading set meter_id = new.id, organization_id = new.organization_id where meter_id = old.id;
        end if;
        return new;
      end $$;`);
    this.addSql(`create trigger meter_keeps_its_readings after delete or update of id, organization_id on "meter"
      for each row execute function meter_keeps_its_readings();`);

    this.addSql(`create or replace function app_user_readings_follow() returns trigger
      language plpgsql security definer set search_path = public as $$
      begin
        if tg_op = 'DELETE' then
          update meter_reading set recorded_by_id = null where recorded_by_id = old.id;
          return old;
        end if;
        if new.id <> old.id then
          update meter_reading set recorded_by_id = new.id where recorded_by_id = old.id;
        end if;
        return new;
      end $$;`);
    this.addSql(`create trigger app_user_readings_follow after delete or update of id on "app_user"
      for each row execute function app_user_readings_follow();`);
  }

  override async down(): Promise<void> {
    this.addSql(`drop trigger if exists app_user_readings_follow on "app_user";`);
    this.addSql(`drop function if exists app_user_readings_follow();`);
    this.addSql(`drop trigger if exists meter_keeps_its_readings on "meter";`);
    this.addSql(`drop function if exists meter_keeps_its_readings();`);
    this.addSql(`drop trigger if exists meter_reading_check_references_update on "meter_reading";`);
    this.addSql(`drop trigger if exists meter_reading_check_references_insert on "meter_reading";`);
    this.addSql(`drop function if exists meter_reading_check_references();`);
    this.addSql(
      `alter table "meter_reading" add constraint "meter_reading_organization_id_foreign" foreign key ("organization_id") references "organization" ("id") on update cascade;`,
    );
    this.addSql(`alter table "meter_reading" add constraint "meter_reading_meter_id_foreign" foreign key ("meter_id") references "meter" ("id") on update cascade;`);
    this.addSql(
      `alter table "meter_reading" add constraint "meter_reading_recorded_by_id_foreign" foreign key ("recorded_by_id") references "app_user" ("id") on update cascade on delete set null;`,
    );
  }
}
