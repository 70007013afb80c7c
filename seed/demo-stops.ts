/**
 * A year of stops on the demo shop's main machines, so the reliability page has figures to show:
 * unplanned failure stops coded with mode, cause and remedy (the shop's starter codes), and a
 * planned maintenance stop every month or so. Deterministic, ending before the seeding moment.
 */
import { Machine } from '../server/modules/machines/machine.entity';
import { MachineDowntime } from '../server/modules/machines/machine-state.entity';
import { Membership } from '../server/modules/users/user.entity';
import { mulberry32 } from './prng';
import { clock } from '../shared/clock';
import type { SeedStep } from './demo';

const HOUR = 3_600_000;
const DAY = 24 * HOUR;

/** What fails on each kind of machine, as mode / cause / remedy codes with the reason an operator would give. */
const FAILURES: Record<string, [string, string, string, string][]> = {
  'punch-plasma-cell': [
    ['STOPS', 'DIRT', 'CLEAN', 'Torch lifter stalls on slag build-up'],
    ['CUTQ', 'WORN', 'SWAP', 'Bevelled cut edge: worn torch parts'],
    ['POSN', 'LOOSE', 'ALIGN', 'Holes off position: clamp slipping'],
    ['LEAK', 'HYDR', 'SWAP', 'Oil at the ram seal'],
    ['CTRL', 'ELEC', 'RESET', 'Control drops out during nesting'],
  ],
  'plasma-table': [
    ['NOSTART', 'ELEC', 'SWAP', 'Arc will not transfer'],
    ['CUTQ', 'DIRT', 'CLEAN', 'Dross on the cut: water table full of slag'],
    ['POSN', 'LOOSE', 'ALIGN', 'Gantry racking'],
  ],
  'press-brake': [
    ['GUARD', 'DIRT', 'CLEAN', 'Light curtain trips: dirty lens'],
    ['LEAK', 'HYDR', 'FIX', 'Oil weeping at a hose fitting'],
    ['POSN', 'SETUP', 'ALIGN', 'Angle out: back gauge not zeroed'],
  ],
  'hydraulic-unit': [
    ['NOISE', 'WORN', 'SWAP', 'Pump whining: worn coupling'],
    ['LEAK', 'LOOSE', 'FIX', 'Return line fitting loose'],
  ],
};

export const seedStopsDemo: SeedStep = async (em, shop) => {
  const machines = await em.find(Machine, { organization: shop.id, code: { $in: ['C1', 'C2', 'P1', 'B1', 'H1'] } }, { filters: false });
  const tech = await em.findOne(Membership, { organization: shop.id, role: 'technician' }, { filters: false });
  const rnd = mulberry32(20261205);
  const now = clock.ms();
  for (const m of machines) {
    const failures = FAILURES[m.kind] ?? [];
    // Planned stops: roughly monthly, two to four hours.
    for (let d = 360; d > 10; d -= 26 + Math.floor(rnd() * 10)) {
      const startedAt = new Date(now - d * DAY + (6 + Math.floor(rnd() * 4)) * HOUR);
      em.create(MachineDowntime, {
        organization: shop.id,
        machine: m,
        kind: 'planned',
        reason: 'Monthly maintenance',
        startedAt,
        startedBy: tech?.user ?? null,
        endedAt: new Date(startedAt.getTime() + (2 + rnd() * 2) * HOUR),
        endedBy: tech?.user ?? null,
      });
    }
    // Failures: a handful a year, each down from half an hour to most of a shift.
    if (failures.length === 0) continue;
    // The newest within the last few weeks, so the page's default window shows some.
    for (let d = 4 + Math.floor(rnd() * 18); d < 360; d += 35 + Math.floor(rnd() * 50)) {
      const [mode, cause, remedy, reason] = failures[Math.floor(rnd() * failures.length)];
      const startedAt = new Date(now - d * DAY + (7 + Math.floor(rnd() * 8)) * HOUR);
      em.create(MachineDowntime, {
        organization: shop.id,
        machine: m,
        kind: 'failure',
        reason,
        failureCode: mode,
        causeCode: cause,
        remedyCode: remedy,
        startedAt,
        startedBy: tech?.user ?? null,
        endedAt: new Date(startedAt.getTime() + (0.5 + rnd() * 6) * HOUR),
        endedBy: tech?.user ?? null,
      });
    }
  }
  await em.flush();
};
