/**
 * Demo safety history for the invented Alder Row shop: procedures for the demo machines, a year
 * of lockouts, PPE checks, training, one certified periodic inspection, fire watches, and a
 * valid signature chain. Runs after the machines step; without machines it does nothing.
 * Every person, place and machine here is invented.
 */
import { DateTime } from 'luxon';
import { Machine, type IMachine } from '../server/modules/machines/machine.entity';
import { Organization } from '../server/modules/organizations/organization.entity';
import { Membership } from '../server/modules/users/user.entity';
import { EnergyProcedure, ProcedureVersion, type IProcedureVersion } from '../server/modules/safety/procedure.entity';
import { LockoutMember, LockoutPoint, LockoutSession, type ILockoutMember, type ILockoutSession } from '../server/modules/safety/lockout.entity';
import {
  FireWatch,
  PeriodicInspection,
  PpeCheck,
  PpeRequirement,
  TrainingRecord,
  type IFireWatch,
  type IPeriodicInspection,
} from '../server/modules/safety/records.entity';
import { appendSignOff, type SignInput } from '../server/modules/safety/chain';
import { contentDigest } from '../server/modules/safety/procedures.service';
import { derivedFor, ppeCheckDetails } from '../server/modules/safety/ppe.service';
import { DEFAULT_SAFETY_SETTINGS } from '../server/modules/safety/settings';
import type { Principal } from '../server/http/principal';
import { pointTag, type ProcedureContent, type EnergySource, type MinorTask } from '../shared/schemas/safety-procedures';
import type { PpeItem } from '../shared/schemas/safety-ppe';
import type { SeedStep } from './demo';
import { clock } from '../shared/clock';
import { formatDateTime, shopLocale } from '../shared/locale';

const src = (s: EnergySource) => s;

/** Torch consumable change: minor servicing under alternative measures (OSHA 29 CFR 1910.147(a)(2)(ii) note). */
export const TORCH_TASK = 'torch-consumables';
const torchConsumables = (source: string): MinorTask => ({
  key: TORCH_TASK,
  name: 'Torch consumable change (electrode, nozzle, shield, swirl ring)',
  alternativeMeasures: [
    `Plasma power source off at its own disconnect ${source}, the control's torch-change mode on, and its key kept by the operator`,
    'Wait for the torch to cool; parts out with the torch wrench only, never by hand near the arc path',
    'Any other work on the torch, leads or power source: full lockout under this procedure',
  ],
});

/**
 * The hydraulic unit's pressure line: one isolation point that feeds both cells. It lives on the
 * unit's procedure (with the cells it feeds) and each cell's procedure names it under the same tag.
 */
const hydraulicSupply = (h: IMachine): EnergySource => ({
  key: pointTag(h.code, 2),
  kind: 'hydraulic',
  description: 'Accumulator and pressure line to the cells',
  magnitude: '210 bar',
  isolationDevice: 'Lockable supply valve V12; dump valve V11',
  location: 'Accumulator block on the hydraulic unit',
  relieveMethod: 'Close V12, then open V11 until PG1 reads 0 bar',
  verifyMethod: 'PG1 reads 0 bar; the cell clamps do not move on jog',
});

function cellContent(m: IMachine, extraStep?: string, shared?: EnergySource): ProcedureContent {
  return {
    title: `Full energy isolation of ${m.name}`,
    scope: 'Any work inside the guarded area: punch head and tooling, torch and consumables, clamps, table and chip conveyor.',
    sources: [
      src({
        key: pointTag(m.code, 1),
        kind: 'electrical',
        description: 'Main supply to the control cabinet',
        magnitude: '480 V 3-phase, 100 A',
        isolationDevice: 'Main disconnect Q0',
        location: 'Cabinet door, left side',
        relieveMethod: 'Wait 5 minutes for the servo drive capacitors to discharge (drive LEDs dark)',
        verifyMethod: 'Try start at the panel; test L1-L2-L3 to earth at Q0 outgoing side with a proven tester',
      }),
      src({
        key: pointTag(m.code, 2),
        kind: 'hydraulic',
        description: 'Ram hydraulics with bladder accumulator',
        magnitude: '210 bar, 4 L accumulator',
        isolationDevice: `Pump runs from ${pointTag(m.code, 1)}; accumulator dump valve V7`,
        location: 'Hydraulic unit behind the cell',
        relieveMethod: 'Open V7 and leave it open until gauge PG2 reads 0 bar',
        verifyMethod: 'PG2 reads 0 bar; ram does not move on jog',
      }),
      src({
        key: pointTag(m.code, 3),
        kind: 'pneumatic',
        description: 'Clamp and table air',
        magnitude: '6 bar',
        isolationDevice: 'Lockable ball valve with exhaust V1',
        location: 'Air drop at the column next to the cell',
        relieveMethod: 'Close V1; the exhaust port vents the line',
        verifyMethod: 'Gauge at the clamp manifold reads 0; clamps open by hand',
      }),
      src({
        key: pointTag(m.code, 4),
        kind: 'plasma-power',
        description: 'Plasma power source of the torch',
        magnitude: '480 V in, 300 V DC open circuit',
        isolationDevice: 'Plasma source disconnect Q5',
        location: 'Plasma cabinet, front',
        relieveMethod: 'Wait 2 minutes after switch-off',
        verifyMethod: 'Source display dark; no pilot arc on a test fire from the control',
      }),
      src({
        key: pointTag(m.code, 5),
        kind: 'gravity',
        description: 'Raised punch head and upper clamp beam',
        magnitude: 'About 180 kg',
        isolationDevice: 'Red safety block under the ram',
        location: 'Punch head, front',
        relieveMethod: 'Lower the ram onto the safety block before isolating',
        verifyMethod: 'Block seated and pinned; no gap under the ram',
      }),
      ...(shared ? [shared] : []),
    ],
    steps: {
      prepare: ['Tell the operator and everyone at the cell that it will be locked out and why.', 'Read this procedure and collect your own locks and tags.'],
      shutdown: [
        'Finish or stop the program at a safe point, park the head, lower the ram onto the safety block.',
        'Press the cycle stop, then switch the panel off.',
      ],
      isolate: ['Open Q0 and Q5; close V1.', ...(shared ? [`Close the supply from the hydraulic unit at ${shared.isolationDevice} (${shared.key}).`] : [])],
      apply: ['Put your own lock and tag on Q0, Q5, V1 and the V7 valve cover.'],
      relieve: ['Open V7 until PG2 reads 0 bar; wait for the drive LEDs to go dark.', ...(extraStep ? [extraStep] : [])],
      verify: [
        'Try to start the cell from the panel.',
        'Test for voltage at Q0 outgoing terminals with a proven tester; check PG2 and the clamp gauge read 0.',
        'Return the panel controls to off.',
      ],
    },
    release: [
      'Remove tools, refit guards and check the machine is intact.',
      'Make sure everyone is clear of the cell.',
      'Tell the operator that locks are coming off; remove only your own locks and tags.',
    ],
    minorTasks: [torchConsumables(`Q5 (${pointTag(m.code, 4)})`)],
  };
}

function tableContent(m: IMachine): ProcedureContent {
  return {
    title: `Energy isolation of ${m.name}`,
    scope: 'Torch, gantry, slats and water table work.',
    sources: [
      src({
        key: pointTag(m.code, 1),
        kind: 'electrical',
        description: 'Gantry drives and control',
        magnitude: '480 V 3-phase, 32 A',
        isolationDevice: 'Disconnect Q1',
        location: 'Table control cabinet',
        relieveMethod: 'Wait 3 minutes for the drive capacitors',
        verifyMethod: 'Try jog from the pendant; test at Q1 outgoing side',
      }),
      src({
        key: pointTag(m.code, 2),
        kind: 'plasma-power',
        description: 'Plasma power source',
        magnitude: '480 V in, 300 V DC open circuit',
        isolationDevice: 'Disconnect Q2',
        location: 'Beside the power source',
        relieveMethod: 'Wait 2 minutes after switch-off',
        verifyMethod: 'Display dark; no pilot arc on a test fire',
      }),
      src({
        key: pointTag(m.code, 3),
        kind: 'pneumatic',
        description: 'Plasma and shield gas (air)',
        magnitude: '7 bar',
        isolationDevice: 'Lockable valve V2',
        location: 'Air drop behind the table',
        relieveMethod: 'Close V2; purge from the torch test button',
        verifyMethod: 'Gas console gauge reads 0',
      }),
    ],
    steps: {
      prepare: ['Tell the operator the table will be locked out.'],
      shutdown: ['Stop the program and park the gantry at the load end.'],
      isolate: ['Open Q1 and Q2; close V2.'],
      apply: ['Put your own lock and tag on Q1, Q2 and V2.'],
      relieve: ['Purge the gas line from the torch test button until the gauge reads 0.'],
      verify: ['Try to jog the gantry and fire the torch from the control; both must do nothing.'],
    },
    release: ['Clear tools and offcuts from the slats.', 'Make sure everyone is clear.', 'Tell the operator; remove your own locks.'],
    minorTasks: [torchConsumables(`Q2 (${pointTag(m.code, 2)})`)],
  };
}

function brakeContent(m: IMachine): ProcedureContent {
  return {
    title: `Energy isolation of ${m.name}`,
    scope: 'Tool changes, back-gauge work and anything between the beams.',
    sources: [
      src({
        key: pointTag(m.code, 1),
        kind: 'electrical',
        description: 'Main supply, pump and back-gauge drives',
        magnitude: '480 V 3-phase, 40 A',
        isolationDevice: 'Main disconnect Q1',
        location: 'Control cabinet, right side',
        relieveMethod: 'Wait 3 minutes for the drive capacitors',
        verifyMethod: 'Try start and jog from the pedal; test at Q1 outgoing side',
      }),
      src({
        key: pointTag(m.code, 2),
        kind: 'hydraulic',
        description: 'Ram cylinders',
        magnitude: '280 bar',
        isolationDevice: `Pump runs from ${pointTag(m.code, 1)}; ram valve block`,
        location: 'Tank on the upper frame',
        relieveMethod: 'Lower the ram onto the wooden blocks so no pressure holds it',
        verifyMethod: 'Pressure gauge on the valve block reads 0 bar',
      }),
      src({
        key: pointTag(m.code, 3),
        kind: 'gravity',
        description: 'Upper beam (ram)',
        magnitude: 'About 900 kg',
        isolationDevice: 'Two hardwood blocks under the ram',
        location: 'Between the beams, left and right',
        relieveMethod: 'Lower the ram onto both blocks',
        verifyMethod: 'Both blocks seated; ram resting on them',
      }),
    ],
    steps: {
      prepare: ['Tell the operator the brake will be locked out.'],
      shutdown: ['Finish the bend, open the ram to tool-change height, stop the pump.'],
      isolate: ['Place both blocks, lower the ram onto them, then open Q1.'],
      apply: ['Put your own lock and tag on Q1; tag the blocks.'],
      relieve: ['Check the ram rests on the blocks and the gauge reads 0 bar.'],
      verify: ['Try to start the pump and press the pedal; nothing may move.'],
    },
    release: [
      'Remove tools, check the dies are clamped.',
      'Make sure everyone is clear of the beams.',
      'Tell the operator; remove your own lock, then the blocks.',
    ],
  };
}

function hydraulicContent(m: IMachine, fed: IMachine[]): ProcedureContent {
  return {
    title: `Energy isolation of ${m.name}`,
    scope: 'Filter changes, oil changes, hose and valve work.',
    sources: [
      src({
        key: pointTag(m.code, 1),
        kind: 'electrical',
        description: 'Pump motor',
        magnitude: '480 V 3-phase, 15 kW',
        isolationDevice: 'Motor isolator Q3',
        location: 'On the unit',
        relieveMethod: 'None stored',
        verifyMethod: 'Press pump start; motor stays still',
      }),
      src({ ...hydraulicSupply(m), ...(fed.length ? { feeds: fed.map((c) => c.id) } : {}) }),
      src({
        key: pointTag(m.code, 3),
        kind: 'thermal',
        description: 'Hot oil and tank surfaces',
        magnitude: 'Up to 60 °C',
        isolationDevice: 'None: wait',
        location: 'Tank and return line',
        relieveMethod: 'Let the oil cool below 40 °C on the tank thermometer',
        verifyMethod: 'Tank thermometer below 40 °C',
      }),
    ],
    steps: {
      prepare: ['Tell the cell operator the hydraulics will be down.'],
      shutdown: ['Stop the cell, then the pump.'],
      isolate: ['Open Q3; close V12.'],
      apply: ['Put your own lock and tag on Q3, V12 and the V11 cover.'],
      relieve: ['Open V11; wait for PG1 to read 0 bar and the oil to cool.'],
      verify: ['Press pump start; check PG1 and the thermometer.'],
    },
    release: ['Close V11, refit guards.', 'Make sure everyone is clear.', 'Tell the cell operators; remove your own locks.'],
  };
}

function extractorContent(m: IMachine): ProcedureContent {
  return {
    title: `Energy isolation of ${m.name}`,
    scope: 'Cartridge changes, dust bin and fan work.',
    sources: [
      src({
        key: pointTag(m.code, 1),
        kind: 'electrical',
        description: 'Fan motor and controller',
        magnitude: '480 V 3-phase, 11 kW',
        isolationDevice: 'Isolator Q4',
        location: 'Side of the unit',
        relieveMethod: 'Let the fan run down fully',
        verifyMethod: 'Press start; fan stays still',
      }),
      src({
        key: pointTag(m.code, 2),
        kind: 'pneumatic',
        description: 'Pulse-cleaning air',
        magnitude: '6 bar',
        isolationDevice: 'Lockable valve V3',
        location: 'Air inlet on the header tank',
        relieveMethod: 'Close V3 and fire one manual pulse to vent',
        verifyMethod: 'Header tank gauge reads 0',
      }),
      src({
        key: pointTag(m.code, 3),
        kind: 'stored-mechanical',
        description: 'Fan impeller run-down',
        magnitude: 'About 2 minutes',
        isolationDevice: 'None: wait',
        location: 'Fan housing',
        relieveMethod: 'Wait until the impeller stops (look through the inspection port)',
        verifyMethod: 'Impeller visibly still',
      }),
    ],
    steps: {
      prepare: ['Tell the cell operator that extraction will stop; no cutting meanwhile.'],
      shutdown: ['Stop the fan at the controller.'],
      isolate: ['Open Q4; close V3.'],
      apply: ['Put your own lock and tag on Q4 and V3.'],
      relieve: ['Fire one manual pulse; wait for the impeller to stop.'],
      verify: ['Press start; check the header gauge reads 0 and the impeller is still.'],
    },
    release: ['Close the cartridge doors.', 'Make sure everyone is clear.', 'Tell the cell operator; remove your own locks.'],
  };
}

type Ev = { at: Date; run: () => Promise<void> };

export const seedSafetyDemo: SeedStep = async (rootEm, shop) => {
  const em = rootEm.fork();
  em.setFilterParams('org', { orgId: shop.id });
  const machines = await em.find(Machine, { active: true, parent: null }, { orderBy: { code: 'asc' } });
  const cells = machines.filter((m) => m.kind === 'punch-plasma-cell');
  const table = machines.find((m) => m.kind === 'plasma-table');
  const hyd = machines.find((m) => m.kind === 'hydraulic-unit');
  const brake = machines.find((m) => m.kind === 'press-brake');
  const fume = machines.find((m) => m.kind === 'fume-extractor');
  if (cells.length === 0 && !table) return; // no demo machines: nothing to attach safety records to

  const members = await em.find(Membership, { organization: shop.id, active: true }, { filters: false, populate: ['user'] });
  const orgName = (await em.findOneOrFail(Organization, shop.id, { filters: false })).name;
  const person = (role: string): Principal => {
    const m = members.find((x) => x.role === role);
    if (!m) throw new Error(`demo safety seed: no ${role} in the demo shop`);
    const u = m.user.getEntity();
    return { userId: u.id, orgId: shop.id, role: m.role, name: u.name, email: u.email, orgName, timeZone: shop.timeZone, locale: shopLocale() };
  };
  const safety = person('safety');
  const tech = person('technician');
  const operator = person('operator');
  const tz = shop.timeZone;
  const now = DateTime.fromMillis(clock.ms()).setZone(tz);
  const day = (daysAgo: number, hour: number, minute = 0) => now.minus({ days: daysAgo }).set({ hour, minute, second: 0, millisecond: 0 }).toJSDate();
  const dateOf = (d: Date) => DateTime.fromJSDate(d, { zone: tz }).toISODate()!;
  // As the fire-watch service words its summaries (server/modules/safety/records.service.ts).
  const hm = (d: Date) => `${formatDateTime(d, { timeZone: tz, locale: shopLocale() })} (${tz})`;

  await em.transactional(async (tx) => {
    const events: Ev[] = [];
    const sign = (who: Principal, input: SignInput, at: Date) => appendSignOff(tx, who, input, at);

    // Procedures: version 1 about eleven months ago; the first cell got a version 2 three months ago.
    const versions = new Map<string, IProcedureVersion>();
    const firstVersions = new Map<string, IProcedureVersion>();
    const plans: { m: IMachine; content: ProcedureContent; approvedDaysAgo: number; v2?: { content: ProcedureContent; daysAgo: number } }[] = [];
    // The hydraulic unit feeds both cells: their procedures name its pressure line under its own tag.
    const shared = hyd ? hydraulicSupply(hyd) : undefined;
    cells.forEach((m, i) =>
      plans.push({
        m,
        content: cellContent(m, undefined, shared),
        approvedDaysAgo: 330 - i * 5,
        ...(i === 0 ? { v2: { content: cellContent(m, 'Check the V7 valve cover is closed and locked after relieving.', shared), daysAgo: 90 } } : {}),
      }),
    );
    if (table) plans.push({ m: table, content: tableContent(table), approvedDaysAgo: 320 });
    if (brake) plans.push({ m: brake, content: brakeContent(brake), approvedDaysAgo: 318 });
    if (hyd) plans.push({ m: hyd, content: hydraulicContent(hyd, cells), approvedDaysAgo: 315 });
    if (fume) plans.push({ m: fume, content: extractorContent(fume), approvedDaysAgo: 300 });
    const procs = new Map<string, string>();
    for (const p of plans) {
      const proc = tx.create(EnergyProcedure, { organization: shop.id, machine: p.m, title: (p.v2?.content ?? p.content).title });
      procs.set(p.m.id, proc.id);
      const approveAt = day(p.approvedDaysAgo, 10);
      const v1 = tx.create(ProcedureVersion, {
        organization: shop.id,
        procedure: proc,
        version: 1,
        status: p.v2 ? 'superseded' : 'approved',
        content: p.content,
        author: tech.userId,
        retrainingRequired: true,
        createdAt: day(p.approvedDaysAgo + 3, 9),
      });
      versions.set(p.m.id, v1);
      firstVersions.set(p.m.id, v1);
      events.push({
        at: approveAt,
        run: async () => {
          const s = await sign(
            safety,
            {
              meaning: 'procedure-approved',
              subjectType: 'procedure-version',
              subjectId: v1.id,
              machineId: p.m.id,
              details: {
                summary: `${p.content.title} — version 1`,
                procedureId: proc.id,
                version: 1,
                contentSha256: contentDigest(p.content),
                energySources: p.content.sources.map((x) => x.key),
                photos: 0,
                retrainingRequired: true,
              },
            },
            approveAt,
          );
          Object.assign(v1, { approvedAt: approveAt, approvedBy: safety.userId, approvalSignOff: s });
        },
      });
      if (p.v2) {
        const v2c = p.v2.content;
        const at2 = day(p.v2.daysAgo, 11);
        const v2 = tx.create(ProcedureVersion, {
          organization: shop.id,
          procedure: proc,
          version: 2,
          status: 'approved',
          content: v2c,
          author: tech.userId,
          retrainingRequired: true,
          createdAt: day(p.v2.daysAgo + 2, 9),
        });
        versions.set(p.m.id, v2);
        events.push({
          at: at2,
          run: async () => {
            const s = await sign(
              safety,
              {
                meaning: 'procedure-approved',
                subjectType: 'procedure-version',
                subjectId: v2.id,
                machineId: p.m.id,
                details: {
                  summary: `${v2c.title} — version 2, replaces version 1`,
                  procedureId: proc.id,
                  version: 2,
                  contentSha256: contentDigest(v2c),
                  energySources: v2c.sources.map((x) => x.key),
                  photos: 0,
                  retrainingRequired: true,
                },
              },
              at2,
            );
            Object.assign(v2, { approvedAt: at2, approvedBy: safety.userId, approvalSignOff: s });
          },
        });
      }
    }

    // Training: the technician and the safety officer (authorized: the safety officer joins group lockouts
    // only with a training record) and the operator (affected) on version 1, the authorized ones again on
    // the first cell's version 2; the operator also on the torch consumable change as minor servicing
    // where the procedure names it.
    for (const p of plans) {
      const procId = procs.get(p.m.id)!;
      const torchTask = (p.v2?.content ?? p.content).minorTasks?.find((t) => t.key === TORCH_TASK)?.key ?? null;
      for (const [who, kind, daysAgo, version, minorTask] of [
        [tech, 'authorized', p.approvedDaysAgo - 4, 1, null],
        [safety, 'authorized', p.approvedDaysAgo - 4, 1, null],
        [operator, 'affected', p.approvedDaysAgo - 5, 1, null],
        ...(p.v2 ? [[tech, 'authorized', p.v2.daysAgo - 6, 2, null] as const, [safety, 'authorized', p.v2.daysAgo - 6, 2, null] as const] : []),
        ...(torchTask ? [[operator, 'minor-servicing', (p.v2?.daysAgo ?? p.approvedDaysAgo) - 5, p.v2 ? 2 : 1, torchTask] as const] : []),
      ] as const) {
        const at = day(daysAgo, 14);
        events.push({
          at,
          run: async () => {
            const rec = tx.create(TrainingRecord, {
              organization: shop.id,
              person: who.userId,
              procedure: procId,
              procedureVersion: version,
              kind,
              minorTask,
              trainedOn: dateOf(at),
              trainer: safety.userId,
              note: null,
              signOff: null as never,
            });
            rec.signOff = (await sign(
              safety,
              {
                meaning: 'training-recorded',
                subjectType: 'training',
                subjectId: rec.id,
                machineId: p.m.id,
                details: {
                  summary: `${who.name}: ${p.m.code} ${p.content.title} v${version}, ${kind === 'minor-servicing' ? `minor servicing (${minorTask})` : `${kind} employee`}, ${dateOf(at)}`,
                  personId: who.userId,
                  personName: who.name,
                  procedureId: procId,
                  procedureVersion: version,
                  kind,
                  minorTask,
                  trainedOn: dateOf(at),
                },
              },
              at,
            )) as never;
          },
        });
      }
    }

    // Lockouts: about every three weeks on some machine, applied, verified and released by the technician.
    let lockNo = 10;
    const lockout = (m: IMachine, start: Date, reason: string, opts: { group?: boolean; open?: boolean } = {}) => {
      const procId = procs.get(m.id);
      if (!procId) return;
      // Each signature is its own event, so another record signed in between lands between them on the chain.
      let s: ILockoutSession;
      let points: { key: string; device: 'blocking' | 'tag-only' | 'lock-and-tag'; lock: string }[] = [];
      const verifyAt = new Date(start.getTime() + 12 * 60_000);
      events.push({
        at: start,
        run: async () => {
          // The version in force on that day.
          const latest = versions.get(m.id)!;
          const version = latest.approvedAt && latest.approvedAt <= start ? latest : firstVersions.get(m.id)!;
          const content = version.content;
          s = tx.create(LockoutSession, {
            organization: shop.id,
            machine: m,
            procedure: procId,
            procedureVersion: version,
            workOrderId: null,
            reason,
            group: !!opts.group,
            state: 'locked',
            primary: tech.userId,
            appliedAt: start,
          });
          points = content.sources.map((x) => ({
            key: x.key,
            device:
              x.kind === 'gravity'
                ? ('blocking' as const)
                : x.kind === 'thermal' || x.kind === 'stored-mechanical'
                  ? ('tag-only' as const)
                  : ('lock-and-tag' as const),
            lock: `A-${String(lockNo++).padStart(3, '0')}`,
          }));
          for (const pt of points)
            tx.create(LockoutPoint, {
              organization: shop.id,
              session: s,
              sourceKey: pt.key,
              device: pt.device,
              lockNumber: pt.lock,
              tagNumber: null,
              // The seeded tag-only points (heat, run-down) have no device that could take a lock: 1910.147(c)(3)(i).
              tagJustification: pt.device === 'tag-only' ? 'cannot-take-lock' : null,
              tagMeasure: null,
              appliedBy: tech.userId,
              holder: tech.userId,
              appliedAt: start,
            });
          await sign(
            tech,
            {
              meaning: 'lockout-applied',
              subjectType: 'lockout-session',
              subjectId: s.id,
              machineId: m.id,
              details: {
                summary: `${m.code} v${version.version}: ${points.map((x) => `${x.key} ${x.device.replace(/-/g, ' ')} ${x.lock}${x.device === 'tag-only' ? ' — cannot take a lock (1910.147(c)(3)(i))' : ''}`).join(', ')} — ${reason}`,
                procedureId: procId,
                procedureVersion: version.version,
                reason,
                group: !!opts.group,
                workOrderId: null,
                points: points.map((x) => ({
                  key: x.key,
                  device: x.device,
                  lock: x.lock,
                  tag: null,
                  ...(x.device === 'tag-only' ? { tagJustification: 'cannot-take-lock', tagMeasure: null } : {}),
                })),
              },
            },
            start,
          );
        },
      });
      events.push({
        at: verifyAt,
        run: async () => {
          await sign(
            tech,
            {
              meaning: 'isolation-verified',
              subjectType: 'lockout-session',
              subjectId: s.id,
              machineId: m.id,
              details: {
                summary: `${m.code}: start attempted; zero energy at ${points.map((x) => x.key).join(', ')}`,
                points: points.map((x) => x.key),
                startAttempted: true,
              },
            },
            verifyAt,
          );
          s.state = 'verified';
          s.verifiedAt = verifyAt;
        },
      });
      if (opts.group) {
        const joinAt = new Date(verifyAt.getTime() + 5 * 60_000);
        const leaveAt = new Date(joinAt.getTime() + 100 * 60_000);
        let member: ILockoutMember;
        events.push({
          at: joinAt,
          run: async () => {
            member = tx.create(LockoutMember, { organization: shop.id, session: s, user: safety.userId, lockNumber: 'P-TV1', joinedAt: joinAt });
            await sign(
              safety,
              {
                meaning: 'member-joined',
                subjectType: 'lockout-session',
                subjectId: s.id,
                machineId: m.id,
                details: { summary: `${m.code}: personal lock P-TV1 on the group lockout held by ${tech.name}`, lock: 'P-TV1', memberId: member.id },
              },
              joinAt,
            );
          },
        });
        events.push({
          at: leaveAt,
          run: async () => {
            member.leftAt = leaveAt;
            await sign(
              safety,
              {
                meaning: 'member-left',
                subjectType: 'lockout-session',
                subjectId: s.id,
                machineId: m.id,
                details: { summary: `${m.code}: personal lock P-TV1 removed`, lock: 'P-TV1', memberId: member.id },
              },
              leaveAt,
            );
          },
        });
      }
      if (opts.open) return;
      const releaseAt = new Date(start.getTime() + 150 * 60_000);
      events.push({
        at: releaseAt,
        run: async () => {
          await sign(
            tech,
            {
              meaning: 'lockout-released',
              subjectType: 'lockout-session',
              subjectId: s.id,
              machineId: m.id,
              details: {
                summary: `${m.code}: area checked, people clear, affected employees told; removed ${points.map((x) => `${x.key} lock ${x.lock}`).join(', ')}`,
                areaChecked: true,
                peopleClear: true,
                affectedNotified: true,
                removed: points.map((x) => ({ key: x.key, lock: x.lock })),
                workOrderId: null,
              },
            },
            releaseAt,
          );
          const pts = await tx.find(LockoutPoint, { session: s.id });
          for (const pt of pts) Object.assign(pt, { removedAt: releaseAt, removedBy: tech.userId });
          Object.assign(s, { state: 'released', releasedAt: releaseAt });
        },
      });
    };
    const rota = [...cells, table, brake, hyd, fume].filter((m): m is IMachine => !!m);
    const reasons = [
      'Change punch station tooling',
      'Replace torch lead',
      'Change hydraulic return filter',
      'Change extractor cartridges',
      'Replace clamp pads',
      'Clean and re-level slats',
      'Swap ball-screw wiper',
    ];
    for (let i = 0, d = 290; d > 5; i++, d -= 20) lockout(rota[i % rota.length], day(d, 7, 30), reasons[i % reasons.length], { group: i % 5 === 2 });
    // Still open: applied earlier today, or in the last hours when the seed runs before the day shift.
    const openedAt = DateTime.min(DateTime.fromJSDate(day(0, 7, 30)), now.minus({ hours: 3 }).startOf('hour'))!.toJSDate();
    // On the extractor, not the hydraulic unit: a lock on the unit's shared point would stop both cells all day.
    const stillOpen = fume ?? hyd;
    if (stillOpen) lockout(stillOpen, openedAt, stillOpen === fume ? 'Fan bearing replacement in progress' : 'Hose replacement in progress', { open: true });

    // PPE requirements and ten weeks of shift checks (a few missed).
    const reqs: {
      m: IMachine;
      task: string;
      items: PpeItem[];
      arc: number | null;
      noise: { levelDbA: number; hours: number }[];
      peakDbC?: number;
      protectorNrr?: number;
    }[] = [];
    for (const c of cells) {
      reqs.push({
        m: c,
        task: 'Plasma cutting and punching',
        items: ['safety-glasses', 'cut-resistant-gloves', 'safety-footwear'],
        arc: 130,
        noise: [
          { levelDbA: 91, hours: 5 },
          { levelDbA: 84, hours: 3 },
        ],
        // Punching is impact noise: its peak is checked against 140 dB, and the issued plugs are rated.
        peakDbC: 131,
        protectorNrr: 29,
      });
    }
    if (table)
      reqs.push({
        m: table,
        task: 'Plasma cutting',
        items: ['safety-glasses', 'cutting-gauntlets', 'safety-footwear', 'flame-resistant-clothing'],
        arc: 80,
        noise: [{ levelDbA: 88, hours: 6 }],
      });
    if (brake)
      reqs.push({
        m: brake,
        task: 'Bending',
        items: ['safety-glasses', 'cut-resistant-gloves', 'safety-footwear'],
        arc: null,
        noise: [{ levelDbA: 83, hours: 8 }],
      });
    if (hyd) reqs.push({ m: hyd, task: 'Hydraulic maintenance', items: ['safety-glasses', 'safety-footwear'], arc: null, noise: [] });
    const reqAt = day(71, 5);
    // The latest weekday shift start (06:00 or 14:00) before the seed runs: the plasma table's
    // check from then on is missed, so whatever the day, the demo has a PPE check waiting.
    const latestShiftStart = [0, 1, 2, 3, 4, 5, 6, 7]
      .flatMap((d) => [day(d, 14), day(d, 6)])
      .find((at) => at.getTime() <= now.toMillis() && DateTime.fromJSDate(at, { zone: tz }).weekday <= 5)!;
    for (const r of reqs) {
      const req = tx.create(PpeRequirement, {
        organization: shop.id,
        machine: r.m,
        task: r.task,
        items: r.items,
        otherItems: [],
        arcCurrentA: r.arc,
        noise: r.noise,
        peakDbC: r.peakDbC ?? null,
        protectorNrr: r.protectorNrr ?? null,
        cadence: r.m.kind === 'hydraulic-unit' ? 'none' : 'shift',
        active: true,
        createdAt: reqAt,
      });
      if (req.cadence === 'none') continue;
      const derived = derivedFor(req, DEFAULT_SAFETY_SETTINGS);
      for (let d = 70; d >= 1; d--) {
        const wd = DateTime.fromJSDate(day(d, 6), { zone: tz }).weekday;
        if (wd > 5) continue;
        for (const hour of [6, 14]) {
          if ((d * 7 + hour + r.m.code.length) % 11 === 0) continue; // a missed check now and then
          const at = day(d, hour, 4 + ((d + hour) % 9));
          if (r.m === table && at >= latestShiftStart) continue;
          const who = hour === 6 ? operator : tech;
          events.push({
            at,
            run: async () => {
              const check = tx.create(PpeCheck, {
                organization: shop.id,
                machine: r.m,
                requirement: req,
                person: who.userId,
                checkedAt: at,
                items: derived.required.map((i) => i.code),
                signOff: null as never,
              });
              check.signOff = (await sign(
                who,
                {
                  meaning: 'ppe-check-done',
                  subjectType: 'ppe-check',
                  subjectId: check.id,
                  machineId: r.m.id,
                  details: ppeCheckDetails(r.m.code, req, derived),
                },
                at,
              )) as never;
            },
          });
        }
      }
    }

    // One periodic inspection performed and certified (first cell), one performed and waiting for certification (table).
    const inspect = (m: IMachine | undefined, daysAgo: number, certify: boolean) => {
      if (!m || !procs.get(m.id)) return;
      const at = day(daysAgo, 9, 30);
      let performed: IPeriodicInspection;
      events.push({
        at,
        run: async () => {
          const v = versions.get(m.id)!;
          const employees = [{ id: tech.userId, name: tech.name }];
          const ins = tx.create(PeriodicInspection, {
            organization: shop.id,
            procedure: procs.get(m.id)!,
            procedureVersion: v.version,
            inspectedOn: dateOf(at),
            inspector: safety.userId,
            employees,
            findings: 'Watched a full application: every point locked, V7 opened, try-start done. Technician explained each step.',
            deviations: null,
            performedSignOff: null as never,
          });
          performed = ins;
          ins.performedSignOff = (await sign(
            safety,
            {
              meaning: 'inspection-performed',
              subjectType: 'periodic-inspection',
              subjectId: ins.id,
              machineId: m.id,
              details: {
                summary: `${m.code} ${v.content.title} v${v.version}, ${dateOf(at)}: ${tech.name}`,
                procedureId: procs.get(m.id)!,
                procedureVersion: v.version,
                inspectedOn: dateOf(at),
                employees,
                findings: ins.findings,
                deviations: null,
                responsibilitiesReviewed: true,
              },
            },
            at,
          )) as never;
        },
      });
      if (!certify) return;
      const cAt = new Date(at.getTime() + 26 * 3600_000);
      events.push({
        at: cAt,
        run: async () => {
          const v = versions.get(m.id)!;
          const ins = performed;
          const employees = ins.employees;
          const c = await sign(
            safety,
            {
              meaning: 'inspection-certified',
              subjectType: 'periodic-inspection',
              subjectId: ins.id,
              machineId: m.id,
              details: {
                summary: `${m.code} ${v.content.title} v${v.version}: inspected ${dateOf(at)} by ${safety.name}; employees ${tech.name}`,
                procedureId: procs.get(m.id)!,
                procedureVersion: v.version,
                inspectedOn: dateOf(at),
                inspectorId: safety.userId,
                inspectorName: safety.name,
                employees,
                performedSignOffId: ins.performedSignOff.id,
              },
            },
            cAt,
          );
          Object.assign(ins, { certifiedAt: cAt, certifiedBy: safety.userId, certifySignOff: c });
        },
      });
    };
    inspect(cells[0], 45, true);
    inspect(table, 12, false);

    // Fire watches after cutting on the table (OSHA 1910.252 rule: 30 minutes).
    if (table) {
      for (const d of [9, 4, 2]) {
        const ended = day(d, 15, 40);
        const until = new Date(ended.getTime() + 30 * 60_000);
        const endAt = new Date(until.getTime() + 3 * 60_000);
        let fw: IFireWatch;
        events.push({
          at: ended,
          run: async () => {
            fw = tx.create(FireWatch, {
              organization: shop.id,
              machine: table,
              watcher: operator.userId,
              cuttingEndedAt: ended,
              until,
              rule: 'osha-1910.252',
              area: 'Plasma table and the pallet rack behind it',
              startSignOff: null as never,
            });
            fw.startSignOff = (await sign(
              operator,
              {
                meaning: 'fire-watch-started',
                subjectType: 'fire-watch',
                subjectId: fw.id,
                machineId: table.id,
                details: {
                  summary: `${table.code}: cutting ended ${hm(ended)}, watch until ${hm(until)} (OSHA 29 CFR 1910.252(a)(2)(iii)(B))`,
                  cuttingEndedAt: ended.toISOString(),
                  until: until.toISOString(),
                  rule: 'osha-1910.252',
                  area: fw.area,
                },
              },
              ended,
            )) as never;
          },
        });
        events.push({
          at: endAt,
          run: async () => {
            fw.endSignOff = (await sign(
              operator,
              {
                meaning: 'fire-watch-ended',
                subjectType: 'fire-watch',
                subjectId: fw.id,
                machineId: table.id,
                details: { summary: `${table.code}: watched from ${hm(ended)} to ${hm(endAt)}, no fire found`, noFireFound: true, rule: 'osha-1910.252' },
              },
              endAt,
            )) as never;
            fw.endedAt = endAt;
          },
        });
      }
    }

    // Signatures go into the chain in time order.
    events.sort((a, b) => a.at.getTime() - b.at.getTime());
    for (const e of events) await e.run();
  });
};
