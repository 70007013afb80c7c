/**
 * Isolation points shared between machines: one energy source (a hydraulic unit's pressure line)
 * that feeds several machines. The point belongs to the supplying machine's procedure and lists the
 * machines it feeds; each fed machine's procedure names the same point by its tag, because all
 * energy isolating devices needed to isolate a machine are part of its procedure
 * (OSHA 29 CFR 1910.147(c)(4)(ii)(B), (d)(3)).
 */
import type { EntityManager } from '@mikro-orm/postgresql';
import { Machine } from '../machines/machine.entity';
import { conflict, fieldError } from '../../http/errors';
import { missingPointText, type EnergySource, type FeedingPoint, type ProcedureContent } from '../../../shared/schemas/safety-procedures';

/** Every fed machine is an active machine of this shop and not the procedure's own machine. */
export async function refuseBadFeeds(em: EntityManager, machine: { id: string; code: string }, content: ProcedureContent): Promise<void> {
  const ids = [...new Set(content.sources.flatMap((s) => s.feeds ?? []))];
  if (ids.length === 0) return;
  // The shop filter applies: another shop's machine is simply not found.
  const found = new Map((await em.find(Machine, { id: { $in: ids } })).map((m) => [m.id, m]));
  content.sources.forEach((s, i) =>
    (s.feeds ?? []).forEach((id, j) => {
      const path = `sources.${i}.feeds.${j}`;
      const m = found.get(id);
      if (!m) throw fieldError(path, `${s.key} feeds a machine this shop does not have`);
      if (m.id === machine.id) throw fieldError(path, `${s.key} is on ${machine.code} itself; list only the other machines it feeds`);
      if (!m.active) throw fieldError(path, `${m.code} is deactivated; a point cannot feed it`);
    }),
  );
}

type FeedingSql = { content: ProcedureContent; machine_id: string; code: string; name: string };

/** Points of other machines' approved procedures that feed any of these machines, by fed machine. */
export async function feedingPointsOf(em: EntityManager, orgId: string, machineIds: string[]): Promise<Map<string, FeedingPoint[]>> {
  const out = new Map<string, FeedingPoint[]>();
  if (machineIds.length === 0) return out;
  const rows = await em.execute<FeedingSql[]>(
    `select v.content, m.id as machine_id, m.code, m.name
       from safety_procedure_version v join safety_procedure p on p.id = v.procedure_id join machine m on m.id = p.machine_id
      where v.organization_id = ? and v.status = 'approved' and m.active
        and exists (select 1 from jsonb_array_elements(v.content->'sources') s, jsonb_array_elements_text(coalesce(s->'feeds', '[]'::jsonb)) f(id)
                     where f.id = any(?::text[]))
      order by m.code`,
    [orgId, `{${machineIds.join(',')}}`],
  );
  for (const r of rows) {
    for (const s of r.content.sources) {
      for (const fed of s.feeds ?? []) {
        if (!machineIds.includes(fed) || fed === r.machine_id) continue;
        const { feeds: _feeds, ...point } = s;
        out.set(fed, [...(out.get(fed) ?? []), { ...point, fromMachine: { id: r.machine_id, code: r.code, name: r.name } }]);
      }
    }
  }
  return out;
}

/**
 * Approval of a fed machine's procedure: every point that feeds it must be among its sources,
 * under the same tag. Refused with 409 naming the point and where it comes from.
 */
export async function requireFeedingPoints(em: EntityManager, orgId: string, machine: { id: string; code: string }, sources: EnergySource[]) {
  const feeding = (await feedingPointsOf(em, orgId, [machine.id])).get(machine.id) ?? [];
  const missing = feeding.filter((p) => !sources.some((s) => s.key === p.key));
  if (missing.length === 0) return;
  throw conflict(
    missing.map((p) => missingPointText(p, machine.code)).join('. '),
    missing.map((p) => ({ path: 'sources', message: `Missing shared point ${p.key} from ${p.fromMachine.code}` })),
  );
}

/** Codes and names of the machines the given contents' sources feed (for "also feeds C1, C2"). */
export async function fedMachineNames(em: EntityManager, contents: ProcedureContent[]): Promise<Record<string, { code: string; name: string }>> {
  const ids = [...new Set(contents.flatMap((c) => c.sources.flatMap((s) => s.feeds ?? [])))];
  if (ids.length === 0) return {};
  const machines = await em.find(Machine, { id: { $in: ids } }, { fields: ['code', 'name'] });
  return Object.fromEntries(machines.map((m) => [m.id, { code: m.code, name: m.name }]));
}
