/**
 * Demo machines of the invented shop "Alder Row Sheetworks": two punch/plasma cells (C1, C2)
 * with torch and punch-head components, a plasma table (P1), a press brake (B1), a hydraulic
 * unit (H1) and a fume extractor (F1); their meters with a year of readings; a part catalogue
 * with invented part numbers; a year of consumable changes, stock moves, punch sharpenings
 * and cut-quality coupons. Deterministic (seeded PRNG) and bulk-inserted to stay fast.
 */
import { randomUUID } from 'node:crypto';
import type { EntityManager } from '@mikro-orm/postgresql';
import type { SeedStep } from './demo';
import { Membership } from '../server/modules/users/user.entity';
import { Machine } from '../server/modules/machines/machine.entity';
import { Meter, MeterReading } from '../server/modules/meters/meter.entity';
import { PartType, StockMove } from '../server/modules/stock/stock.entity';
import { ConsumableChange, ConsumableInstall, CutCheck } from '../server/modules/station/consumable.entity';
import { PunchTool, ToolSharpening } from '../server/modules/punch-tools/punch-tool.entity';
import { couponResult } from '../shared/domain/consumables';
import type { RemovalReason } from '../shared/schemas/consumables';
import type { TorchCategory } from '../shared/schemas/stock';
import { mulberry32 } from './prng';
import { clock } from '../shared/clock';

/** mulberry32: small, fast, deterministic. */
function prng(seed: number) {
  const next = mulberry32(seed);
  return {
    next,
    between: (lo: number, hi: number) => lo + (hi - lo) * next(),
    normal: (mean: number, sd: number) => mean + sd * Math.sqrt(-2 * Math.log(1 - next())) * Math.cos(2 * Math.PI * next()),
    weibull: (shape: number, scale: number) => scale * Math.pow(-Math.log(1 - next()), 1 / shape),
    pick: <T>(items: readonly [T, number][]): T => {
      let u = next() * items.reduce((s, [, w]) => s + w, 0);
      for (const [v, w] of items) if ((u -= w) <= 0) return v;
      return items[items.length - 1][0];
    },
  };
}

const DAY = 86_400_000;
const HOUR = 3_600_000;
const round = (v: number, d = 2) => Math.round(v * 10 ** d) / 10 ** d;

type Row = Record<string, unknown>;
/** Rows for em.insertMany: ids and timestamps are given here, since insertMany skips hooks. */
const row = (orgId: string, at: Date, data: Row): Row => ({ id: randomUUID(), createdAt: at, updatedAt: at, organization: orgId, ...data });

async function insertAll(em: EntityManager, entity: unknown, rows: Row[]) {
  for (let i = 0; i < rows.length; i += 2000) await em.insertMany(entity as never, rows.slice(i, i + 2000) as never);
}

type TorchSpec = { code: string; startsPerDay: number; hoursPerStart: number; parts: Record<TorchCategory, string>; scale: Record<TorchCategory, number> };

export const seedMachines: SeedStep = async (em, shop) => {
  const rnd = prng(20261201);
  const org = shop.id;
  const people = await em.find(Membership, { organization: org }, { filters: false, populate: ['user'] });
  const byRole = (r: string) => people.find((m) => m.role === r)?.user.id ?? people[0].user.id;
  const operator = byRole('operator');
  const tech = byRole('technician');

  const now = clock.now();
  const today = Date.UTC(now.getUTCFullYear(), now.getUTCMonth(), now.getUTCDate());
  const start = today - 365 * DAY;
  const created = new Date(start - 30 * DAY);

  // ── Machines and components ─────────────────────────────────────────────
  const machines: Row[] = [];
  const machine = (code: string, name: string, kind: string, extra: Row = {}) => {
    const r = row(org, created, { code, name, kind, parent: null, location: null, serial: null, notes: null, active: true, ...extra });
    machines.push(r);
    return r.id as string;
  };
  const c1 = machine('C1', 'Punch/plasma cell 1', 'punch-plasma-cell', {
    location: 'Bay 1',
    serial: 'PPC-19-0412',
    notes: 'Torch 130 A air plasma beside a 20-station turret.',
  });
  const c1t = machine('C1-T', 'Plasma torch, cell 1', 'torch', { parent: c1, location: 'Bay 1', serial: 'TH-130-5521' });
  const c1p = machine('C1-P', 'Punch head, cell 1', 'punch-head', { parent: c1, location: 'Bay 1' });
  const c2 = machine('C2', 'Punch/plasma cell 2', 'punch-plasma-cell', { location: 'Bay 2', serial: 'PPC-21-0877' });
  const c2t = machine('C2-T', 'Plasma torch, cell 2', 'torch', { parent: c2, location: 'Bay 2', serial: 'TH-130-6130' });
  const c2p = machine('C2-P', 'Punch head, cell 2', 'punch-head', { parent: c2, location: 'Bay 2' });
  const p1 = machine('P1', 'Plasma table', 'plasma-table', { location: 'Bay 3', serial: 'PT-3015-208', notes: '3 × 1.5 m water table, 80 A torch.' });
  const p1t = machine('P1-T', 'Plasma torch, table', 'torch', { parent: p1, location: 'Bay 3', serial: 'TH-080-1187' });
  machine('B1', 'Press brake', 'press-brake', { location: 'Bay 4', serial: 'PB-110-3104' });
  const h1 = machine('H1', 'Hydraulic unit', 'hydraulic-unit', {
    location: 'Bay 1, pit',
    serial: 'HU-22-0093',
    notes: 'Feeds the clamps and the punch drive of both cells. ISO VG 46 oil.',
  });
  const f1 = machine('F1', 'Fume extractor', 'fume-extractor', {
    location: 'Outside wall, bay 2',
    serial: 'FX-6-4410',
    notes: 'Six cartridges; change all at once.',
  });
  await insertAll(em, Machine, machines);

  // ── Meters ──────────────────────────────────────────────────────────────
  const meters: Row[] = [];
  const meter = (machineId: string, code: string, name: string, kind: string, unit: string, limits: Row = {}) => {
    const r = row(org, created, { machine: machineId, code, name, kind, unit, lowerLimit: null, upperLimit: null, ...limits });
    meters.push(r);
    return r.id as string;
  };
  const m = {
    c1Starts: meter(c1t, 'arc-starts', 'Arc starts', 'count', 'starts'),
    c1Hours: meter(c1t, 'arc-hours', 'Arc hours', 'running-time', 'h'),
    c1Hits: meter(c1p, 'punch-hits', 'Punch hits', 'count', 'hits'),
    c1Run: meter(c1, 'run-hours', 'Run hours', 'running-time', 'h'),
    c2Starts: meter(c2t, 'arc-starts', 'Arc starts', 'count', 'starts'),
    c2Hours: meter(c2t, 'arc-hours', 'Arc hours', 'running-time', 'h'),
    c2Hits: meter(c2p, 'punch-hits', 'Punch hits', 'count', 'hits'),
    c2Run: meter(c2, 'run-hours', 'Run hours', 'running-time', 'h'),
    p1Starts: meter(p1t, 'arc-starts', 'Arc starts', 'count', 'starts'),
    p1Hours: meter(p1t, 'arc-hours', 'Arc hours', 'running-time', 'h'),
    h1Pump: meter(h1, 'pump-hours', 'Pump hours', 'running-time', 'h'),
    h1Temp: meter(h1, 'oil-temp', 'Oil temperature', 'condition', '°C', { lowerLimit: 15, upperLimit: 60 }),
    f1Run: meter(f1, 'run-hours', 'Run hours', 'running-time', 'h'),
    f1Dp: meter(f1, 'filter-dp', 'Filter pressure drop', 'condition', 'Pa', { upperLimit: 1500 }),
  };
  await insertAll(em, Meter, meters);

  // ── Part catalogue (invented part numbers) ──────────────────────────────
  const parts: Row[] = [];
  const onHand = new Map<string, number>();
  const part = (
    partNumber: string,
    name: string,
    category: string,
    lifeUnit: string | null,
    expectedLife: number | null,
    unitCost: number,
    leadTimeDays: number,
    stockUnit = 'pcs',
  ) => {
    const r = row(org, created, {
      partNumber,
      name,
      category,
      stockUnit,
      lifeUnit,
      expectedLife,
      unitCost,
      onHand: 0,
      leadTimeDays,
      serviceLevel: 0.95,
      active: true,
    });
    parts.push(r);
    onHand.set(r.id as string, 0);
    return r.id as string;
  };
  const big = {
    electrode: part('TX-2201', 'Electrode 130 A air', 'electrode', 'starts', 1000, 14.8, 7),
    nozzle: part('TX-2202', 'Nozzle 130 A air', 'nozzle', 'starts', 900, 11.6, 7),
    'swirl-ring': part('TX-2205', 'Swirl ring 130 A', 'swirl-ring', 'starts', 5000, 9.4, 10),
    shield: part('TX-2208', 'Shield 130 A', 'shield', 'starts', 2600, 12.9, 10),
    'retaining-cap': part('TX-2210', 'Retaining cap 130 A', 'retaining-cap', 'starts', 20000, 21.5, 14),
  } satisfies Record<TorchCategory, string>;
  const small = {
    electrode: part('TX-1101', 'Electrode 80 A air', 'electrode', 'starts', 800, 11.2, 7),
    nozzle: part('TX-1102', 'Nozzle 80 A air', 'nozzle', 'starts', 700, 8.9, 7),
    'swirl-ring': part('TX-1105', 'Swirl ring 80 A', 'swirl-ring', 'starts', 4500, 7.8, 10),
    shield: part('TX-1108', 'Shield 80 A', 'shield', 'arc-hours', 60, 10.4, 10),
    'retaining-cap': part('TX-1110', 'Retaining cap 80 A', 'retaining-cap', 'starts', 18000, 17.9, 14),
  } satisfies Record<TorchCategory, string>;
  part('PT-B-RD12', 'Round punch 12 mm, station B', 'punch', 'hits', 120_000, 86, 21);
  part('PT-C-SQ25', 'Square punch 25 mm, station C', 'punch', 'hits', 100_000, 132, 21);
  part('DI-B-RD12', 'Die 12.2 mm, station B', 'die', 'hits', 400_000, 64, 21);
  const returnFilter = part('HF-10-R', 'Return filter element 10 µm', 'hydraulic-filter', 'hours', 2000, 48, 10);
  const cartridge = part('FX-C325', 'Extractor filter cartridge', 'extractor-cartridge', null, null, 118, 14);
  const oil = part('HO-46', 'Hydraulic oil ISO VG 46', 'oil', null, null, 3.9, 5, 'L');
  part('GR-EP2', 'Grease EP2 for guides and screws', 'grease', null, null, 7.5, 5, 'kg');
  // Change costs of the torch parts: a planned change is the part plus about 6 minutes of
  // fitting; a failure in service adds a scrapped sheet and stopped time (invented figures).
  for (const [id, failureCost] of [
    [big.electrode, 160],
    [big.nozzle, 120],
    [small.electrode, 110],
    [small.nozzle, 90],
  ] as const) {
    const r = parts.find((x) => x.id === id)!;
    Object.assign(r, { plannedChangeCost: Number(r.unitCost) + 6, failureCost });
  }
  await insertAll(em, PartType, parts);

  // Stock moves are written in time order so each row's on-hand-after is right.
  const moves: Row[] = [];
  const move = (partTypeId: string, at: Date, kind: string, quantity: number, reason: string | null, by: string, ref?: { type: string; id: string }) => {
    const after = onHand.get(partTypeId)! + quantity;
    onHand.set(partTypeId, after);
    moves.push(row(org, at, { partType: partTypeId, kind, quantity, onHandAfter: after, reason, by, refType: ref?.type ?? null, refId: ref?.id ?? null }));
  };
  for (const p of parts)
    move(
      p.id as string,
      new Date(start - DAY),
      'adjusted',
      p.stockUnit === 'L' ? 200 : p.category === 'electrode' || p.category === 'nozzle' ? 30 : 12,
      'Opening stock',
      tech,
    );

  // ── Readings and consumable changes, day by day ─────────────────────────
  const readings: Row[] = [];
  const reading = (meterId: string, at: Date, value: number, source = 'import', by: string | null = null, isReset = false) =>
    readings.push(row(org, at, { meter: meterId, value, readAt: at, source, isReset, note: null, recordedBy: by, importKey: null }));
  const changes: Row[] = [];
  const installs: Row[] = [];
  const checks: Row[] = [];

  const torches: (TorchSpec & { id: string; startsMeter: string; hoursMeter: string })[] = [
    {
      code: 'C1-T',
      id: c1t,
      startsMeter: m.c1Starts,
      hoursMeter: m.c1Hours,
      startsPerDay: 310,
      hoursPerStart: 0.0125,
      parts: big,
      scale: { electrode: 1080, nozzle: 980, 'swirl-ring': 5200, shield: 2700, 'retaining-cap': 21000 },
    },
    {
      code: 'C2-T',
      id: c2t,
      startsMeter: m.c2Starts,
      hoursMeter: m.c2Hours,
      startsPerDay: 270,
      hoursPerStart: 0.0135,
      parts: big,
      scale: { electrode: 1040, nozzle: 950, 'swirl-ring': 5000, shield: 2500, 'retaining-cap': 20000 },
    },
    {
      code: 'P1-T',
      id: p1t,
      startsMeter: m.p1Starts,
      hoursMeter: m.p1Hours,
      startsPerDay: 190,
      hoursPerStart: 0.026,
      parts: small,
      scale: { electrode: 860, nozzle: 760, 'swirl-ring': 4600, shield: 2200, 'retaining-cap': 18000 },
    },
  ];
  const SHAPE: Record<TorchCategory, number> = { electrode: 3.4, nozzle: 2.8, 'swirl-ring': 2.2, shield: 1.8, 'retaining-cap': 1.5 };
  type Open = { id: string; category: TorchCategory; partType: string; at: Date; starts: number; hours: number; dueAt: number; preventive: boolean };

  for (const t of torches) {
    let starts = Math.round(rnd.between(40_000, 120_000));
    let hours = round(starts * t.hoursPerStart, 1);
    reading(t.startsMeter, new Date(start - DAY + 21.5 * HOUR), starts);
    reading(t.hoursMeter, new Date(start - DAY + 21.5 * HOUR), hours);
    const open = new Map<TorchCategory, Open>();
    const install = (c: TorchCategory, at: Date, changeId: string | null, s: number, h: number) => {
      const life = rnd.weibull(SHAPE[c], t.scale[c]);
      // Now and then an electrode is changed on plan before it wears out: a suspension in the statistics.
      const preventive = c === 'electrode' && rnd.next() < 0.08;
      const o: Open = {
        id: randomUUID(),
        category: c,
        partType: t.parts[c],
        at,
        starts: s,
        hours: h,
        dueAt: s + Math.max(60, preventive ? life * rnd.between(0.6, 0.85) : life),
        preventive,
      };
      open.set(c, o);
      installs.push({
        ...row(org, at, {}),
        id: o.id,
        torch: t.id,
        partType: o.partType,
        category: c,
        installedAt: at,
        installChange: changeId,
        startsAtInstall: s,
        arcHoursAtInstall: h,
        removedAt: null,
        removalChange: null,
        removalReason: null,
        lifeStarts: null,
        lifeArcHours: null,
      });
      move(
        o.partType,
        at,
        'used',
        -1,
        `Consumable change on ${t.code}`,
        changeId ? operator : tech,
        changeId ? { type: 'ConsumableChange', id: changeId } : undefined,
      );
    };
    const first = new Date(start - DAY + 22 * HOUR);
    for (const c of Object.keys(t.scale) as TorchCategory[]) install(c, first, null, starts, hours);

    /** The part whose life ran out gets the reason; the others came out with it. */
    const change = (at: Date, cats: TorchCategory[], lead: TorchCategory, reason: RemovalReason, s: number, h: number) => {
      const id = randomUUID();
      const withElectrode = cats.includes('electrode');
      const used = withElectrode ? (s - open.get('electrode')!.starts) / t.scale.electrode : 0;
      changes.push({
        ...row(org, at, {}),
        id,
        torch: t.id,
        changedAt: at,
        startsReading: s,
        arcHoursReading: h,
        pitDepthMm: withElectrode && rnd.next() < 0.6 ? round(Math.max(0.2, 0.45 + 0.6 * used + rnd.normal(0, 0.12)), 2) : null,
        note: null,
        by: rnd.next() < 0.85 ? operator : tech,
      });
      reading(t.startsMeter, at, s, 'consumable-change', operator);
      reading(t.hoursMeter, at, h, 'consumable-change', operator);
      for (const c of cats) {
        const old = open.get(c)!;
        const inst = installs.find((i) => i.id === old.id)!;
        Object.assign(inst, {
          removedAt: at,
          removalChange: id,
          removalReason: c === lead || reason === 'preventive' ? reason : 'with-partner',
          lifeStarts: s - old.starts,
          lifeArcHours: round(h - old.hours, 3),
          updatedAt: at,
        });
        install(c, at, id, s, h);
      }
    };

    for (let d = start; d < today; d += DAY) {
      const weekday = new Date(d).getUTCDay();
      if (weekday === 0 || weekday === 6) continue;
      const shiftStart = d + 12 * HOUR;
      const shiftLen = 9.5 * HOUR;
      const dayStarts = Math.max(0, Math.round(rnd.normal(t.startsPerDay, t.startsPerDay * 0.22)));
      const perStart = t.hoursPerStart * rnd.between(0.85, 1.15);
      const s0 = starts;
      const h0 = hours;
      // Changes fall where a part's drawn life runs out during the shift; a damaged part now and then.
      for (;;) {
        const next = [...open.values()].sort((a, b) => a.dueAt - b.dueAt)[0];
        if (next.dueAt > s0 + dayStarts) break;
        const s = Math.round(next.dueAt);
        const at = new Date(shiftStart + ((s - s0) / Math.max(1, dayStarts)) * shiftLen);
        const h = round(h0 + (s - s0) * perStart, 3);
        let cats: TorchCategory[];
        let reason: RemovalReason;
        if (next.category === 'electrode') {
          cats = rnd.next() < 0.9 ? ['electrode', 'nozzle'] : ['electrode'];
          reason = next.preventive
            ? 'preventive'
            : rnd.pick<RemovalReason>([
                ['worn', 78],
                ['failed-start', 11],
                ['poor-cut', 11],
              ]);
          if (rnd.next() < 0.12) cats.push('swirl-ring');
        } else if (next.category === 'nozzle') {
          cats = ['nozzle'];
          reason = rnd.pick<RemovalReason>([
            ['poor-cut', 50],
            ['worn', 32],
            ['damaged', 8],
            ['gas-pressure', 5],
            ['moisture', 5],
          ]);
        } else {
          cats = [next.category];
          reason = rnd.pick<RemovalReason>([
            ['worn', 70],
            ['damaged', 30],
          ]);
        }
        change(at, cats, next.category, reason, s, h);
      }
      if (rnd.next() < 0.015) {
        // After the day's wear-out changes, so lives never run backwards.
        const knocked: TorchCategory = rnd.next() < 0.5 ? 'shield' : 'nozzle';
        change(
          new Date(shiftStart + shiftLen - 600_000),
          [knocked],
          knocked,
          rnd.next() < 0.7 ? 'damaged' : 'torch-height',
          s0 + dayStarts,
          round(h0 + dayStarts * perStart, 3),
        );
      }
      starts = s0 + dayStarts;
      hours = round(h0 + dayStarts * perStart, 3);
      reading(t.startsMeter, new Date(shiftStart + shiftLen), starts);
      reading(t.hoursMeter, new Date(shiftStart + shiftLen), hours);
      // A weekly test coupon (Wednesdays): deviation grows as the electrode wears.
      if (weekday === 3) {
        const el = open.get('electrode')!;
        const wear = (starts - el.starts) / t.scale.electrode;
        const dev = () => round(rnd.normal(0.02 + 0.18 * wear * wear, 0.05), 3);
        const dims = [
          { label: 'Length', nominalMm: 100, measuredMm: round(100 + dev(), 3) },
          { label: 'Width', nominalMm: 50, measuredMm: round(50 + dev(), 3) },
          { label: 'Hole Ø', nominalMm: 20, measuredMm: round(20 - Math.abs(dev()), 3) },
        ];
        const res = couponResult(dims, 0.2);
        const at = new Date(shiftStart + shiftLen - HOUR);
        checks.push({
          ...row(org, at, {}),
          torch: t.id,
          checkedAt: at,
          toleranceMm: 0.2,
          dimensions: dims,
          maxDeviationMm: res.maxDeviationMm,
          passed: res.passed,
          installIds: [...open.values()].map((o) => o.id),
          by: operator,
          note: null,
        });
      }
    }
  }

  // Cell 2's latest coupon, after its last change, came out of tolerance: its station suggests a change.
  const c2Last = Math.max(...changes.filter((c) => c.torch === c2t).map((c) => (c.changedAt as Date).getTime()));
  const late = new Date(Math.max(c2Last + HOUR, today - 5 * HOUR));
  if (late.getTime() < now.getTime()) {
    const dims = [
      { label: 'Length', nominalMm: 100, measuredMm: 100.31 },
      { label: 'Width', nominalMm: 50, measuredMm: 50.12 },
      { label: 'Hole Ø', nominalMm: 20, measuredMm: 19.74 },
    ];
    const res = couponResult(dims, 0.2);
    const openIds = installs.filter((i) => i.torch === c2t && i.removedAt === null).map((i) => i.id as string);
    checks.push({
      ...row(org, late, {}),
      torch: c2t,
      checkedAt: late,
      toleranceMm: 0.2,
      dimensions: dims,
      maxDeviationMm: res.maxDeviationMm,
      passed: res.passed,
      installIds: openIds,
      by: operator,
      note: 'Bevel on the hole side',
    });
  }

  // ── Other meters: hits, run hours, pump hours, oil temperature, filter pressure drop ──
  let hits1 = 2_400_000;
  let hits2 = 1_650_000;
  let run1 = 18_400;
  let run2 = 9_900;
  let pump = 21_300;
  let frun = 12_700;
  let dp = 640;
  const hitLog: { meter: string; at: Date; value: number }[] = [];
  for (let d = start; d < today; d += DAY) {
    const weekday = new Date(d).getUTCDay();
    const at = new Date(d + 21.5 * HOUR);
    const working = weekday !== 0 && weekday !== 6;
    if (working) {
      hits1 += Math.max(0, Math.round(rnd.normal(4200, 900)));
      hits2 += Math.max(0, Math.round(rnd.normal(3600, 800)));
      run1 = round(run1 + rnd.between(7.5, 9.5), 1);
      run2 = round(run2 + rnd.between(6.5, 9.5), 1);
      pump = round(pump + rnd.between(13, 15.5), 1);
      frun = round(frun + rnd.between(8, 10), 1);
      // Cartridges load up with dust; a change brings the drop back down (a condition reading may fall).
      dp += rnd.between(4, 12);
      if (dp > 1420) {
        const changeAt = new Date(d + 14 * HOUR);
        reading(m.f1Dp, changeAt, Math.round(dp), 'manual', tech);
        move(cartridge, changeAt, 'used', -6, 'Cartridge change on F1', tech);
        dp = rnd.between(520, 600);
      }
      reading(m.c1Hits, at, hits1);
      reading(m.c2Hits, at, hits2);
      hitLog.push({ meter: m.c1Hits, at, value: hits1 }, { meter: m.c2Hits, at, value: hits2 });
      reading(m.c1Run, at, run1);
      reading(m.c2Run, at, run2);
      reading(m.h1Pump, at, pump);
      reading(m.f1Run, at, frun);
      reading(m.f1Dp, at, Math.round(dp));
      const season = Math.sin(((new Date(d).getUTCMonth() - 3) / 12) * 2 * Math.PI);
      reading(m.h1Temp, at, round(44 + 7 * season + rnd.normal(0, 2.2), 1), 'manual', operator);
    }
    // Hydraulic return filter every 2,000 pump hours or so; oil top-ups now and then.
    if (working && rnd.next() < 0.012) move(returnFilter, new Date(d + 15 * HOUR), 'used', -1, 'Return filter change on H1', tech);
    if (working && rnd.next() < 0.03) move(oil, new Date(d + 15 * HOUR), 'used', -round(rnd.between(4, 12), 0), 'Top-up on H1', tech);
  }

  // ── Punch tools and their sharpenings ───────────────────────────────────
  const tools: Row[] = [];
  const sharpenings: Row[] = [];
  const toolSpecs = [
    { head: c1p, meter: m.c1Hits, code: 'C1-T01', name: 'Round 12 mm', size: 'B', every: 400_000 },
    { head: c1p, meter: m.c1Hits, code: 'C1-T02', name: 'Square 25 mm', size: 'C', every: 350_000 },
    { head: c1p, meter: m.c1Hits, code: 'C1-T03', name: 'Oblong 8 × 30 mm', size: 'C', every: 300_000 },
    { head: c1p, meter: m.c1Hits, code: 'C1-T04', name: 'Round 76 mm', size: 'D', every: 300_000 },
    { head: c2p, meter: m.c2Hits, code: 'C2-T01', name: 'Round 6.5 mm', size: 'A', every: 450_000 },
    { head: c2p, meter: m.c2Hits, code: 'C2-T02', name: 'Rectangle 10 × 40 mm', size: 'C', every: 300_000 },
    { head: c2p, meter: m.c2Hits, code: 'C2-T03', name: 'Louvre form', size: 'E', every: 250_000 },
  ];
  for (const s of toolSpecs) {
    const log = hitLog.filter((h) => h.meter === s.meter);
    const toolId = randomUUID();
    let base = log[0].value;
    let lastAt: Date | null = null;
    // Intervals are in hits of the head's meter; tools are sharpened near them, one is left overdue.
    const overdue = s.code === 'C1-T04';
    for (const h of log) {
      const since = h.value - base;
      if (since >= s.every * rnd.between(0.9, 1.05) && !(overdue && h.at.getTime() > today - 120 * DAY)) {
        sharpenings.push({
          ...row(org, h.at, {}),
          tool: toolId,
          sharpenedAt: h.at,
          hitsReading: h.value,
          hitsSincePrevious: since,
          removedMm: round(rnd.between(0.1, 0.25), 2),
          by: tech,
          note: null,
        });
        base = h.value;
        lastAt = h.at;
      }
    }
    tools.push({
      ...row(org, created, {}),
      id: toolId,
      machine: s.head,
      hitsMeter: s.meter,
      code: s.code,
      name: s.name,
      stationSize: s.size,
      sharpeningIntervalHits: s.every,
      hitsAtLastSharpening: base,
      lastSharpenedAt: lastAt,
      active: true,
    });
  }

  // Parts arrive when stock runs low (orders placed at the reorder level).
  const used = moves.filter((mv) => mv.kind === 'used').sort((a, b) => (a.createdAt as Date).getTime() - (b.createdAt as Date).getTime());
  const receipts: Row[] = [];
  const level = new Map(
    [...onHand.keys()].map((k) => [k, moves.filter((mv) => mv.partType === k && mv.kind === 'adjusted').reduce((s, mv) => s + (mv.quantity as number), 0)]),
  );
  for (const u of used) {
    const id = u.partType as string;
    const at = u.createdAt as Date;
    const left = level.get(id)! + (u.quantity as number);
    if (left < (parts.find((p) => p.id === id)!.stockUnit === 'L' ? 40 : 8)) {
      const qty = parts.find((p) => p.id === id)!.stockUnit === 'L' ? 200 : 25;
      receipts.push({ partType: id, at: new Date(at.getTime() - HOUR), qty });
      level.set(id, left + qty);
    } else level.set(id, left);
  }
  // Rebuild the move list in time order with receipts in place, recomputing on-hand after each.
  const all = [
    ...moves.filter((mv) => mv.kind !== 'adjusted').map((mv) => ({ at: mv.createdAt as Date, mv })),
    ...receipts.map((r) => ({ at: r.at as Date, mv: null as Row | null, r })),
  ].sort((a, b) => a.at.getTime() - b.at.getTime());
  const opening = moves.filter((mv) => mv.kind === 'adjusted');
  moves.length = 0;
  for (const p of parts) onHand.set(p.id as string, 0);
  for (const o of opening) move(o.partType as string, o.createdAt as Date, 'adjusted', o.quantity as number, 'Opening stock', tech);
  let order = 4100;
  for (const e of all) {
    if (e.mv)
      move(
        e.mv.partType as string,
        e.at,
        'used',
        e.mv.quantity as number,
        e.mv.reason as string,
        e.mv.by as string,
        e.mv.refType ? { type: e.mv.refType as string, id: e.mv.refId as string } : undefined,
      );
    else if ('r' in e && e.r) move(e.r.partType as string, e.at, 'received', e.r.qty as number, `Order ${order++}`, tech);
  }
  // Yesterday's stocktake found only three 130 A shields: the demo has something to reorder.
  const lastMove = Math.max(...moves.map((mv) => (mv.createdAt as Date).getTime()));
  move(big.shield, new Date(Math.min(now.getTime() - HOUR, lastMove + 60_000)), 'adjusted', 3 - onHand.get(big.shield)!, 'Stocktake: three on the shelf', tech);
  for (const p of parts) p.onHand = onHand.get(p.id as string);

  await insertAll(em, MeterReading, readings);
  await insertAll(em, ConsumableChange, changes);
  await insertAll(em, ConsumableInstall, installs);
  await insertAll(em, CutCheck, checks);
  await insertAll(em, PunchTool, tools);
  await insertAll(em, ToolSharpening, sharpenings);
  await insertAll(em, StockMove, moves);
  for (const p of parts) await em.execute('update part_type set on_hand = ? where id = ?', [p.onHand, p.id]);
};
