/** What the safety screens pick from: whole machines with their procedures and open lockouts, and the shop's people. */
import { feedingPointsOf } from './shared-points';
import type { EntityManager } from '@mikro-orm/postgresql';
import { Machine } from '../machines/machine.entity';
import type { Principal } from '../../http/principal';

/** Machines with what the safety screens need: procedure and open lockouts. */
export async function safetyMachines(em: EntityManager, who: Principal) {
  // Whole machines only: procedures and lockouts are per machine, not per component.
  const machines = await em.find(Machine, { active: true, parent: null }, { orderBy: { code: 'asc' } });
  const procs = await em.getConnection().execute<{ id: string; machine_id: string; title: string; version: number | null }[]>(
    `select p.id, p.machine_id, p.title, (select max(v.version) from safety_procedure_version v where v.procedure_id = p.id and v.status = 'approved') as version
       from safety_procedure p where p.organization_id = ? order by p.title`,
    [who.orgId],
  );
  const open = await em
    .getConnection()
    .execute<{ machine_id: string; n: string }[]>(
      `select machine_id, count(*) as n from safety_lockout where organization_id = ? and state <> 'released' group by machine_id`,
      [who.orgId],
    );
  // Shared points on other machines that feed each one, so the editor can offer them.
  const feeding = await feedingPointsOf(
    em,
    who.orgId,
    machines.map((m) => m.id),
  );
  return machines.map((m) => ({
    id: m.id,
    code: m.code,
    name: m.name,
    kind: m.kind,
    procedures: procs
      .filter((p) => p.machine_id === m.id)
      .map((p) => ({ id: p.id, title: p.title, approvedVersion: p.version === null ? null : Number(p.version) })),
    openLockouts: Number(open.find((o) => o.machine_id === m.id)?.n ?? 0),
    feedingPoints: feeding.get(m.id) ?? [],
  }));
}

/** Active people of the shop, for pickers (hand-over, inspection, training). */
export async function safetyPeople(em: EntityManager, who: Principal) {
  const rows = await em
    .getConnection()
    .execute<{ id: string; name: string; role: string }[]>(
      `select u.id, u.name, m.role from membership m join app_user u on u.id = m.user_id where m.organization_id = ? and m.active order by u.name`,
      [who.orgId],
    );
  return rows;
}
