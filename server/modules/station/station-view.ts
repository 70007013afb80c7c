import type { EntityManager } from '@mikro-orm/postgresql';
import { executeBound } from '../../db';
import { notFound } from '../../http/errors';
import { ilikeExact } from '../machines/machines.service';
import { stationStatus } from './station-status';
import { workDoneBy } from '../work-orders/station-completion';
import type { Principal } from '../../http/principal';
import { advanceSince } from '../../../shared/domain/meters';
import { lifeFraction, referenceValues } from '../../../shared/domain/consumables';
import { changePlans } from './life-stats.service';
import { TORCH_CATEGORIES, type TorchCategory } from '../../../shared/schemas/stock';
import type { ChangeRow, InstalledPart, PartOption, RemovalReason, StationView, ToolSummary, TorchStation } from '../../../shared/schemas/consumables';
import type { MeterRow } from '../../../shared/schemas/machines';

/*
 * The station page is opened at the machine many times a shift, so it is read with a fixed
 * number of set-based queries whatever the machine holds (torches, parts, tools, meters):
 *   1. the shop's settings, its machines and the torch part catalogue;
 *   2. for the machine's subtree: meters with their latest reading, each torch's last change,
 *      latest cut check and installed parts, the punch tools and the five latest changes;
 *   3. the readings the wear figures need (each counter from the oldest part or sharpening on it);
 *   4-7. open lockouts (on it, and through shared isolation points), open work and alarms (station-status.ts).
 * Plain SQL bypasses the ORM's shop filter, so every query names the organization itself.
 * Rows come back as JSON built by PostgreSQL; timestamps are turned into ISO strings here.
 */

type MachineJson = {
  id: string;
  code: string;
  name: string;
  kind: string;
  location: string | null;
  parentId: string | null;
  active: boolean;
  matches: boolean;
};
type LatestJson = { value: number; readAt: string; isReset: boolean } | null;
type MeterJson = {
  id: string;
  machineId: string;
  code: string;
  name: string;
  kind: MeterRow['kind'];
  unit: string;
  lowerLimit: number | null;
  upperLimit: number | null;
  latest: LatestJson;
};
type TorchJson = {
  torchId: string;
  lastChangeAt: string | null;
  check: { id: string; checkedAt: string; passed: boolean; maxDeviationMm: number; toleranceMm: number } | null;
};
type InstallJson = {
  id: string;
  torchId: string;
  category: TorchCategory;
  installedAt: string;
  startsAtInstall: number | null;
  arcHoursAtInstall: number | null;
  partType: InstalledPart['partType'];
};
type ToolJson = {
  id: string;
  code: string;
  name: string;
  stationSize: string;
  interval: number;
  hitsMeterId: string;
  hitsAtLastSharpening: number;
  since: string;
  latestHits: number | null;
};
type ChangeJson = Omit<ChangeRow, 'parts'> & {
  installed: { category: TorchCategory; partNumber: string }[] | null;
  removed: { category: TorchCategory; reason: RemovalReason | null; lifeStarts: number | null; lifeArcHours: number | null }[] | null;
};
type Reading = { at: Date; value: number; isReset: boolean };

const iso = (s: string | null) => (s === null ? null : new Date(s).toISOString());
const uuids = (ids: string[]) => `{${ids.join(',')}}`;

async function shopAndMachines(em: EntityManager, orgId: string, code: string) {
  const [row] = await executeBound<{ settings: Record<string, unknown>; machines: MachineJson[] | null; parts: PartOption[] | null }>(
    em,
    `select o.settings,
            (select json_agg(json_build_object('id', m.id, 'code', m.code, 'name', m.name, 'kind', m.kind, 'location', m.location,
                                               'parentId', m.parent_id, 'active', m.active, 'matches', m.code ilike ?) order by m.code)
               from machine m where m.organization_id = o.id and (m.active or m.code ilike ?)) as machines,
            (select json_agg(json_build_object('id', p.id, 'partNumber', p.part_number, 'name', p.name, 'category', p.category,
                                               'onHand', p.on_hand, 'stockUnit', p.stock_unit) order by p.part_number)
               from part_type p where p.organization_id = o.id and p.active and p.category = any(?::text[])) as parts
       from organization o where o.id = ?`,
    [ilikeExact(code), ilikeExact(code), `{${TORCH_CATEGORIES.join(',')}}`, orgId],
  );
  return { settings: row?.settings ?? {}, machines: row?.machines ?? [], parts: row?.parts ?? [] };
}

type SubtreeData = {
  meters: MeterJson[] | null;
  torches: TorchJson[] | null;
  installs: InstallJson[] | null;
  tools: ToolJson[] | null;
  changes: ChangeJson[] | null;
};

async function subtreeData(em: EntityManager, orgId: string, subtree: string[], torches: string[], meterMachines: string[]): Promise<SubtreeData> {
  const [row] = await executeBound<SubtreeData>(
    em,
    `select
       (select json_agg(json_build_object('id', me.id, 'machineId', me.machine_id, 'code', me.code, 'name', me.name, 'kind', me.kind, 'unit', me.unit,
                                          'lowerLimit', me.lower_limit, 'upperLimit', me.upper_limit,
                                          'latest', case when lr.read_at is null then null
                                                         else json_build_object('value', lr.value, 'readAt', lr.read_at, 'isReset', lr.is_reset) end)
                        order by me.code)
          from meter me
          left join lateral (select r.value, r.read_at, r.is_reset from meter_reading r where r.meter_id = me.id
                              order by r.read_at desc, r.created_at desc limit 1) lr on true
         where me.organization_id = ? and me.machine_id = any(?::uuid[])) as meters,
       (select json_agg(json_build_object('torchId', t.id, 'lastChangeAt', lc.changed_at,
                                          'check', case when cc.id is null then null
                                                        else json_build_object('id', cc.id, 'checkedAt', cc.checked_at, 'passed', cc.passed,
                                                                               'maxDeviationMm', cc.max_deviation_mm, 'toleranceMm', cc.tolerance_mm) end))
          from unnest(?::uuid[]) t(id)
          left join lateral (select c.changed_at from consumable_change c where c.organization_id = ? and c.torch_id = t.id
                              order by c.changed_at desc limit 1) lc on true
          left join lateral (select k.id, k.checked_at, k.passed, k.max_deviation_mm, k.tolerance_mm from cut_check k
                              where k.organization_id = ? and k.torch_id = t.id order by k.checked_at desc limit 1) cc on true) as torches,
       (select json_agg(json_build_object('id', i.id, 'torchId', i.torch_id, 'category', i.category, 'installedAt', i.installed_at,
                                          'startsAtInstall', i.starts_at_install, 'arcHoursAtInstall', i.arc_hours_at_install,
                                          'partType', json_build_object('id', p.id, 'partNumber', p.part_number, 'name', p.name, 'lifeUnit', p.life_unit,
                                                                        'expectedLife', p.expected_life, 'onHand', p.on_hand, 'stockUnit', p.stock_unit)))
          from consumable_install i join part_type p on p.id = i.part_type_id
         where i.organization_id = ? and i.torch_id = any(?::uuid[]) and i.removed_at is null) as installs,
       (select json_agg(json_build_object('id', pt.id, 'code', pt.code, 'name', pt.name, 'stationSize', pt.station_size,
                                          'interval', pt.sharpening_interval_hits, 'hitsMeterId', pt.hits_meter_id,
                                          'hitsAtLastSharpening', pt.hits_at_last_sharpening, 'since', coalesce(pt.last_sharpened_at, pt.created_at),
                                          'latestHits', lh.value)
                        order by pt.code)
          from punch_tool pt
          left join lateral (select r.value from meter_reading r where r.meter_id = pt.hits_meter_id
                              order by r.read_at desc, r.created_at desc limit 1) lh on true
         where pt.organization_id = ? and pt.active and pt.machine_id = any(?::uuid[])) as tools,
       (select json_agg(json_build_object('id', c.id, 'changedAt', c.changed_at, 'torchCode', t.code,
                                          'startsReading', c.starts_reading, 'arcHoursReading', c.arc_hours_reading, 'pitDepthMm', c.pit_depth_mm,
                                          'by', u.name, 'note', c.note,
                                          'hasPhoto', exists (select 1 from consumable_photo ph where ph.change_id = c.id),
                                          'installed', (select json_agg(json_build_object('category', i.category, 'partNumber', p.part_number))
                                                          from consumable_install i join part_type p on p.id = i.part_type_id
                                                         where i.organization_id = ? and i.install_change_id = c.id),
                                          'removed', (select json_agg(json_build_object('category', r.category, 'reason', r.removal_reason, 'lifeStarts', r.life_starts, 'lifeArcHours', r.life_arc_hours))
                                                        from consumable_install r where r.organization_id = ? and r.removal_change_id = c.id))
                        order by c.changed_at desc, c.id)
          from (select * from consumable_change where organization_id = ? and torch_id = any(?::uuid[])
                 order by changed_at desc, id limit 5) c
          join machine t on t.id = c.torch_id
          left join app_user u on u.id = c.by_id) as changes`,
    [orgId, uuids(meterMachines), uuids(torches), orgId, orgId, orgId, uuids(torches), orgId, uuids(subtree), orgId, orgId, orgId, uuids(torches)],
  );
  return row;
}

/** Readings of each (meter, since) pair taken at or after `since`, oldest first, in one query. */
async function readingsSinceEach(em: EntityManager, wanted: { meterId: string; since: Date }[]): Promise<Reading[][]> {
  const out: Reading[][] = wanted.map(() => []);
  if (wanted.length === 0) return out;
  const rows = await executeBound<{ ord: string; value: number; read_at: Date; is_reset: boolean }>(
    em,
    `select q.ord, r.value, r.read_at, r.is_reset
       from unnest(?::uuid[], ?::timestamptz[]) with ordinality q(meter_id, since, ord)
       join meter_reading r on r.meter_id = q.meter_id and r.read_at >= q.since
      order by q.ord, r.read_at, r.created_at`,
    [uuids(wanted.map((w) => w.meterId)), `{${wanted.map((w) => w.since.toISOString()).join(',')}}`],
  );
  for (const r of rows) out[Number(r.ord) - 1].push({ at: new Date(r.read_at), value: Number(r.value), isReset: r.is_reset });
  return out;
}

/** Ids of a machine and everything below it in the component tree. */
function subtreeOf(all: MachineJson[], rootId: string): Set<string> {
  const ids = new Set([rootId]);
  for (let grew = true; grew;) {
    grew = false;
    for (const m of all) {
      if (m.parentId && ids.has(m.parentId) && !ids.has(m.id)) {
        ids.add(m.id);
        grew = true;
      }
    }
  }
  return ids;
}

/** The machines a component belongs to: a lockout on the cell locks its torch and punch head too. */
function ancestorsOf(all: MachineJson[], machine: MachineJson): string[] {
  const byId = new Map(all.map((m) => [m.id, m]));
  const out: string[] = [];
  for (let id = machine.parentId; id && !out.includes(id); id = byId.get(id)?.parentId ?? null) out.push(id);
  return out;
}

const isStarts = (m: MeterJson) => m.kind === 'count' && m.unit === 'starts';
// Arc time only: a cell's run-hours meter also counts in h but says nothing about the torch.
const isArcHours = (m: MeterJson) => m.kind === 'running-time' && m.code.includes('arc');

/** Everything the station page shows for one machine, found by its code. */
export async function stationView(em: EntityManager, who: Principal, code: string): Promise<StationView> {
  const shop = await shopAndMachines(em, who.orgId, code);
  const machine = shop.machines.find((m) => m.matches);
  if (!machine) throw notFound(`Machine ${code}`);
  const all = shop.machines.filter((m) => m.active);
  const tree = all.some((m) => m.id === machine.id) ? all : [...all, machine];
  const ids = subtreeOf(tree, machine.id);
  const subtree = tree.filter((m) => ids.has(m.id));
  const torches = subtree.filter((m) => m.kind === 'torch');
  // A torch's counters are on the torch itself, else on the machine it belongs to.
  const meterMachines = [...new Set([...subtree.map((m) => m.id), ...torches.flatMap((t) => (t.parentId ? [t.parentId] : []))])];
  const data = await subtreeData(
    em,
    who.orgId,
    subtree.map((m) => m.id),
    torches.map((t) => t.id),
    meterMachines,
  );

  const codeOf = new Map(all.map((m) => [m.id, m.code]));
  const meters = data.meters ?? [];
  const asRow = (m: MeterJson | null): MeterRow | null =>
    m
      ? {
          id: m.id,
          machineId: m.machineId,
          machineCode: codeOf.get(m.machineId) ?? '',
          code: m.code,
          name: m.name,
          kind: m.kind,
          unit: m.unit,
          lowerLimit: m.lowerLimit,
          upperLimit: m.upperLimit,
          latest: m.latest ? { ...m.latest, readAt: iso(m.latest.readAt)! } : null,
        }
      : null;
  const pick = (machineId: string | null, test: (m: MeterJson) => boolean) =>
    machineId ? (meters.find((m) => m.machineId === machineId && test(m)) ?? null) : null;
  const installs = data.installs ?? [];
  const tools = data.tools ?? [];

  // Which readings the wear figures need: each torch counter from its oldest part still in, each hits meter from its oldest sharpening.
  const torchCounters = torches.map((t) => {
    const open = installs.filter((i) => i.torchId === t.id);
    const oldest = open.length ? new Date(Math.min(...open.map((i) => new Date(i.installedAt).getTime()))) : null;
    return {
      torch: t,
      open,
      oldest,
      starts: pick(t.id, isStarts) ?? pick(t.parentId, isStarts),
      arcHours: pick(t.id, isArcHours) ?? pick(t.parentId, isArcHours),
    };
  });
  const wanted: { meterId: string; since: Date }[] = [];
  const slot = (meter: MeterJson | null, since: Date | null) => (meter && since ? wanted.push({ meterId: meter.id, since }) - 1 : -1);
  const torchSlots = torchCounters.map((c) => ({ starts: slot(c.starts, c.oldest), arcHours: slot(c.arcHours, c.oldest) }));
  const hitsMeters = [...new Set(tools.map((t) => t.hitsMeterId))];
  const hitsSlots = new Map(
    hitsMeters.map((id) => [
      id,
      slot({ id } as MeterJson, new Date(Math.min(...tools.filter((t) => t.hitsMeterId === id).map((t) => new Date(t.since).getTime())))),
    ]),
  );
  const readings = await readingsSinceEach(em, wanted);
  const listAt = (i: number) => (i >= 0 ? readings[i] : []);
  const plans = await changePlans(
    em,
    who,
    installs.map((i) => i.partType.id),
  );

  const torchState = new Map((data.torches ?? []).map((t) => [t.torchId, t]));
  const torchViews: TorchStation[] = torchCounters.map((c, n) => {
    const state = torchState.get(c.torch.id);
    const lastChangeAt = state?.lastChangeAt ? new Date(state.lastChangeAt) : null;
    const check = state?.check ?? null;
    const checkedAt = check ? new Date(check.checkedAt) : null;
    const afterLastChange = !!checkedAt && (!lastChangeAt || checkedAt >= lastChangeAt);
    const since = (list: Reading[], has: boolean, start: number | null, from: Date) =>
      !has || start === null
        ? null
        : advanceSince(
            start,
            list.filter((r) => r.at > from),
          );
    const installed: InstalledPart[] = c.open
      .map((i) => {
        const from = new Date(i.installedAt);
        const startsSince = since(listAt(torchSlots[n].starts), !!c.starts, i.startsAtInstall, from);
        const arcHoursSince = since(listAt(torchSlots[n].arcHours), !!c.arcHours, i.arcHoursAtInstall, from);
        const p = i.partType;
        const used = p.lifeUnit === 'starts' ? startsSince : p.lifeUnit === 'arc-hours' ? arcHoursSince : null;
        const expected = p.expectedLife ?? null;
        return {
          installId: i.id,
          category: i.category,
          partType: p,
          installedAt: from.toISOString(),
          startsSince,
          arcHoursSince,
          used,
          expected,
          expectedSource: expected !== null ? ('catalogue' as const) : null,
          fraction: lifeFraction(used, expected),
          plan: plans.get(p.id) ?? null,
        };
      })
      .sort((a, b) => TORCH_CATEGORIES.indexOf(a.category) - TORCH_CATEGORIES.indexOf(b.category));
    return {
      id: c.torch.id,
      code: c.torch.code,
      name: c.torch.name,
      startsMeter: asRow(c.starts),
      arcHoursMeter: asRow(c.arcHours),
      installed,
      lastChangeAt: lastChangeAt?.toISOString() ?? null,
      latestCutCheck:
        check && checkedAt
          ? {
              id: check.id,
              checkedAt: checkedAt.toISOString(),
              passed: check.passed,
              maxDeviationMm: check.maxDeviationMm,
              toleranceMm: check.toleranceMm,
              afterLastChange,
            }
          : null,
      suggestChange: !!check && afterLastChange && !check.passed,
    };
  });

  const toolRows: ToolSummary[] = tools.map((t) => {
    const since = new Date(t.since).getTime();
    const after = listAt(hitsSlots.get(t.hitsMeterId)!).filter((r) => r.at.getTime() > since);
    const hitsSince =
      after.length === 0 ? (t.latestHits === null ? null : Math.max(0, t.latestHits - t.hitsAtLastSharpening)) : advanceSince(t.hitsAtLastSharpening, after);
    const fraction = hitsSince === null ? null : hitsSince / t.interval;
    return {
      id: t.id,
      code: t.code,
      name: t.name,
      stationSize: t.stationSize,
      hitsSince,
      interval: t.interval,
      fraction,
      due: fraction !== null && fraction >= 1,
    };
  });

  const inSubtree = new Set(subtree.map((m) => m.id));
  const machineCode = new Map(subtree.map((m) => [m.id, m.code]));
  const subtreeMeters = meters
    .filter((m) => inSubtree.has(m.machineId))
    .map((m) => ({ ...asRow(m)!, machineCode: machineCode.get(m.machineId)! }))
    .sort((a, b) => a.machineCode.localeCompare(b.machineCode, undefined, { numeric: true }) || a.code.localeCompare(b.code));

  const workOf = await workDoneBy(
    em,
    (data.changes ?? []).map((c) => c.id),
  );
  const recentChanges: ChangeRow[] = (data.changes ?? []).map(({ installed, removed, ...c }) => ({
    id: c.id,
    changedAt: iso(c.changedAt)!,
    torchCode: c.torchCode,
    parts: (installed ?? [])
      .sort((a, b) => TORCH_CATEGORIES.indexOf(a.category) - TORCH_CATEGORIES.indexOf(b.category))
      .map((i) => {
        const out = (removed ?? []).find((r) => r.category === i.category);
        return {
          category: i.category,
          partNumber: i.partNumber,
          reason: out?.reason ?? null,
          lifeStarts: out?.lifeStarts ?? null,
          lifeArcHours: out?.lifeArcHours ?? null,
        };
      }),
    startsReading: c.startsReading,
    arcHoursReading: c.arcHoursReading,
    pitDepthMm: c.pitDepthMm,
    by: c.by,
    hasPhoto: c.hasPhoto,
    note: c.note,
    workOrders: workOf.get(c.id) ?? [],
  }));

  const ref = referenceValues(shop.settings);
  return {
    machine: { id: machine.id, code: machine.code, name: machine.name, kind: machine.kind, location: machine.location },
    torches: torchViews,
    meters: subtreeMeters,
    tools: toolRows,
    partOptions: shop.parts,
    recentChanges,
    ...(await stationStatus(
      em,
      who.orgId,
      subtree.map((m) => m.id),
      ancestorsOf(all, machine),
    )),
    reference: { pitLimitMm: ref.electrodePitLimitMm, cutToleranceMm: ref.cutToleranceMm, changeReliability: ref.changeTargetReliability },
  };
}
