import { Migration } from '@mikro-orm/migrations';

/**
 * A reason per part removed instead of one per change, and the costs of a planned change and
 * of a failure in service per part type.
 * Older changes carried one reason: it now belongs to the part the change was made for (the
 * nozzle for a poor cut when it came out, else the electrode when it came out, else the
 * innermost part) and the other parts of the same change were changed with their partner;
 * a preventive change stays preventive for every part. Same rule as reasonsFromSingle in
 * shared/domain/consumables.ts.
 */
export class Migration20261205104001 extends Migration {
  override async up(): Promise<void> {
    this.addSql(`alter table "consumable_install" drop constraint if exists "consumable_install_removal_reason_check";`);
    this.addSql(`
      with parts as (
        select i.id, i.category, c.reason,
               bool_or(i.category = 'nozzle') over (partition by c.id) as has_nozzle,
               bool_or(i.category = 'electrode') over (partition by c.id) as has_electrode,
               row_number() over (partition by c.id
                                  order by array_position(array['electrode', 'swirl-ring', 'nozzle', 'retaining-cap', 'shield'], i.category::text)) as pos
          from "consumable_install" i join "consumable_change" c on c.id = i.removal_change_id
      ), named as (
        select id, reason,
               case when reason = 'preventive' then true
                    when reason = 'poor-cut' and has_nozzle then category = 'nozzle'
                    when has_electrode then category = 'electrode'
                    else pos = 1 end as is_lead
          from parts
      )
      update "consumable_install" i
         set removal_reason = case when n.is_lead then (case n.reason when 'normal-wear' then 'worn' else n.reason end) else 'with-partner' end
        from named n
       where n.id = i.id;`);
    // Removals without a change record (none expected) keep their reason under its new name.
    this.addSql(`update "consumable_install" set removal_reason = 'worn' where removal_reason = 'normal-wear';`);
    this.addSql(
      `alter table "consumable_install" add constraint "consumable_install_removal_reason_check" check("removal_reason" in ('worn', 'failed-start', 'poor-cut', 'damaged', 'with-partner', 'preventive', 'gas-pressure', 'moisture', 'torch-height'));`,
    );
    this.addSql(`alter table "consumable_change" drop column "reason";`);
    this.addSql(`alter table "part_type" add column "planned_change_cost" numeric(12,2) null, add column "failure_cost" numeric(12,2) null;`);
  }

  override async down(): Promise<void> {
    // Back to one reason per change: the lead part's reason (a process fault counts as damage).
    this.addSql(`alter table "consumable_install" drop constraint if exists "consumable_install_removal_reason_check";`);
    this.addSql(`alter table "consumable_change" add column "reason" text check ("reason" in ('normal-wear', 'failed-start', 'poor-cut', 'damaged', 'preventive')) null;`);
    this.addSql(`
      update "consumable_install" set removal_reason = case removal_reason
        when 'worn' then 'normal-wear' when 'gas-pressure' then 'damaged' when 'moisture' then 'damaged' when 'torch-height' then 'damaged'
        else removal_reason end;`);
    this.addSql(`
      update "consumable_change" c set reason = coalesce(
        (select i.removal_reason from "consumable_install" i where i.removal_change_id = c.id and i.removal_reason <> 'with-partner' limit 1), 'normal-wear');`);
    this.addSql(`update "consumable_install" set removal_reason = 'normal-wear' where removal_reason = 'with-partner';`);
    this.addSql(`alter table "consumable_change" alter column "reason" set not null;`);
    this.addSql(
      `alter table "consumable_install" add constraint "consumable_install_removal_reason_check" check("removal_reason" in ('normal-wear', 'failed-start', 'poor-cut', 'damaged', 'preventive'));`,
    );
    this.addSql(`alter table "part_type" drop column "planned_change_cost", drop column "failure_cost";`);
  }
}
