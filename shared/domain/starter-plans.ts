/**
 * Starter maintenance plans an admin can apply to a machine, written in our own words from common
 * shop practice (intervals are typical starting points, not a maker's schedule: every site adjusts
 * them to its own machines, the maker's manual and local rules).
 *
 * Meters are named by code; applying a starter looks for a meter with one of the listed codes on the
 * machine or its components, then for a single meter of the same unit. Codes used:
 *   pump-hours (h), run-hours (h), arc-starts (starts), hits (hits), filter-dp (Pa), oil-temp (°C).
 */
import type { MachineKind } from '../schemas/machines';
import type { PartCategory } from '../schemas/stock';
import type { Role } from '../permissions';
import type { ChecklistTemplateItem, StationRecordRule } from '../schemas/plans';

export type StarterMeter = { codes: string[]; unit: string };

export type StarterTrigger =
  | { kind: 'calendar-fixed'; rrule: string; time: string }
  | { kind: 'calendar-floating'; every: number; unit: 'day' | 'week' | 'month' }
  | { kind: 'meter'; meter: StarterMeter; every: number }
  | { kind: 'condition'; meter: StarterMeter; above?: number; below?: number }
  | { kind: 'oil-analysis' };

export type StarterPlan = {
  key: string;
  title: string;
  machineKinds: MachineKind[];
  instructions: string;
  checklist: ChecklistTemplateItem[];
  estimatedMinutes: number;
  responsibleRole: Role;
  requiresLockout: boolean;
  safetyCritical: boolean;
  triggers: StarterTrigger[];
  dueSoonDays: number;
  dueSoonFraction: number;
  /** Parts to plan, matched to the shop's catalogue by category (first active part of that category). */
  parts: { category: PartCategory; quantity: number }[];
  /** The station record that does this work (a counter reading is left out: it names a meter of the shop). */
  stationRecord?: Exclude<StationRecordRule, { kind: 'counter-reading' }>;
};

const PUMP_HOURS: StarterMeter = { codes: ['pump-hours', 'hpu-hours'], unit: 'h' };
const RUN_HOURS: StarterMeter = { codes: ['run-hours', 'machine-hours', 'hours'], unit: 'h' };
const ARC_STARTS: StarterMeter = { codes: ['arc-starts', 'pierces', 'starts'], unit: 'starts' };
const HITS: StarterMeter = { codes: ['hits', 'punch-hits', 'strokes'], unit: 'hits' };
const FILTER_DP: StarterMeter = { codes: ['filter-dp', 'cartridge-dp', 'pressure-drop'], unit: 'Pa' };
const OIL_TEMP: StarterMeter = { codes: ['oil-temp', 'oil-temperature'], unit: '°C' };

const check = (key: string, label: string): ChecklistTemplateItem => ({ key, label, kind: 'check' });
const measure = (key: string, label: string, unit: string, min?: number, max?: number): ChecklistTemplateItem => ({
  key,
  label,
  kind: 'measure',
  unit,
  ...(min !== undefined ? { min } : {}),
  ...(max !== undefined ? { max } : {}),
});

export const STARTER_PLANS: readonly StarterPlan[] = [
  {
    key: 'hyd-oil-change',
    title: 'Renew hydraulic oil',
    machineKinds: ['hydraulic-unit', 'press-brake', 'punch-plasma-cell'],
    instructions:
      'Run the unit until the oil is warm, isolate it under the site procedure and relieve accumulator pressure. Drain the tank, wipe out sludge, renew the filters (separate plan) and refill through a filter cart with the grade on the tank label.',
    checklist: [
      check('isolated', 'Unit isolated and accumulator pressure relieved (gauge at zero)'),
      check('drained', 'Old oil drained; tank floor and walls wiped clean'),
      check('grade', 'New oil is the grade on the tank label, pumped through a filter cart'),
      measure('level', 'Oil level on the sight glass after refill, between the marks', '%', 40, 100),
      check('leaks', 'Ran the pump for 10 minutes: no leaks, no foaming'),
    ],
    estimatedMinutes: 180,
    responsibleRole: 'technician',
    requiresLockout: true,
    safetyCritical: false,
    triggers: [
      { kind: 'meter', meter: PUMP_HOURS, every: 4000 },
      { kind: 'calendar-floating', every: 24, unit: 'month' },
    ],
    dueSoonDays: 7,
    dueSoonFraction: 0.05,
    parts: [{ category: 'oil', quantity: 60 }],
  },
  {
    key: 'hyd-filters',
    title: 'Replace hydraulic return and pressure filter elements',
    machineKinds: ['hydraulic-unit', 'press-brake', 'punch-plasma-cell'],
    instructions: 'Isolate the unit and relieve pressure. Replace both elements, check the bypass indicator resets, and note the element condition.',
    checklist: [
      check('isolated', 'Unit isolated and pressure relieved'),
      check('return', 'Return filter element replaced; seal lubricated with clean oil'),
      check('pressure', 'Pressure filter element replaced'),
      check('indicator', 'Clogging indicators reset and showing clean after start-up'),
    ],
    estimatedMinutes: 60,
    responsibleRole: 'technician',
    requiresLockout: true,
    safetyCritical: false,
    triggers: [
      { kind: 'meter', meter: PUMP_HOURS, every: 1000 },
      { kind: 'calendar-floating', every: 12, unit: 'month' },
    ],
    dueSoonDays: 7,
    dueSoonFraction: 0.05,
    parts: [{ category: 'hydraulic-filter', quantity: 2 }],
  },
  {
    key: 'oil-sample',
    title: 'Draw a hydraulic oil sample for the lab',
    machineKinds: ['hydraulic-unit'],
    instructions:
      'With the unit at working temperature, flush the sampling valve into a waste cup, then fill a clean bottle without touching its inside. Label it with the unit code, date and pump hours.',
    checklist: [
      check('flushed', 'Sampling valve flushed (at least five valve volumes)'),
      check('bottle', 'Clean bottle filled, capped and labelled'),
      measure('temp', 'Oil temperature at sampling', '°C', 30, 60),
    ],
    estimatedMinutes: 15,
    responsibleRole: 'technician',
    requiresLockout: false,
    safetyCritical: false,
    triggers: [{ kind: 'calendar-floating', every: 3, unit: 'month' }],
    dueSoonDays: 7,
    dueSoonFraction: 0,
    parts: [],
  },
  {
    key: 'oil-off-target',
    title: 'Act on an oil result outside its targets',
    machineKinds: ['hydraulic-unit'],
    instructions:
      'The last oil result is outside the unit’s cleanliness, viscosity or water targets. Check the breather and filters, look for water ingress, and re-sample after corrective action.',
    checklist: [
      check('breather', 'Tank breather element checked and replaced if loaded'),
      check('filters', 'Filter indicators checked; elements replaced if in bypass'),
      check('water', 'Looked for water ingress (coolers, seals, condensation)'),
      check('resample', 'Re-sample booked after the corrective action'),
    ],
    estimatedMinutes: 90,
    responsibleRole: 'technician',
    requiresLockout: true,
    safetyCritical: false,
    triggers: [{ kind: 'oil-analysis' }],
    dueSoonDays: 2,
    dueSoonFraction: 0,
    parts: [],
  },
  {
    key: 'oil-too-hot',
    title: 'Find out why the hydraulic oil runs hot',
    machineKinds: ['hydraulic-unit'],
    instructions: 'The oil temperature reading went above the limit. Check the cooler, fan and oil level before the next shift.',
    checklist: [
      check('cooler', 'Cooler fins clean; fan runs'),
      measure('level', 'Oil level on the sight glass', '%', 40, 100),
      check('relief', 'No relief valve blowing over at idle (listen, feel the return line)'),
    ],
    estimatedMinutes: 45,
    responsibleRole: 'technician',
    requiresLockout: false,
    safetyCritical: false,
    triggers: [{ kind: 'condition', meter: OIL_TEMP, above: 60 }],
    dueSoonDays: 1,
    dueSoonFraction: 0.05,
    parts: [],
  },
  {
    key: 'extractor-cartridges',
    title: 'Change fume extractor filter cartridges',
    machineKinds: ['fume-extractor'],
    instructions:
      'Cartridges are changed when the pressure drop stays above the limit after pulse cleaning, or after their running hours. Wear the respiratory protection your site requires: the dust is hazardous.',
    checklist: [
      check('isolated', 'Extractor isolated; fan run down'),
      check('ppe', 'Respirator and disposable coverall on before opening the housing'),
      check('bagged', 'Old cartridges bagged and sealed in the housing'),
      check('seals', 'New cartridges seated; door seals intact'),
      measure('dp', 'Pressure drop after restart', 'Pa', 0, 800),
    ],
    estimatedMinutes: 90,
    responsibleRole: 'technician',
    requiresLockout: true,
    safetyCritical: true,
    triggers: [
      { kind: 'condition', meter: FILTER_DP, above: 1500 },
      { kind: 'meter', meter: RUN_HOURS, every: 3000 },
    ],
    dueSoonDays: 3,
    dueSoonFraction: 0.05,
    parts: [{ category: 'extractor-cartridge', quantity: 4 }],
  },
  {
    key: 'extractor-bin',
    title: 'Empty the extractor dust bin',
    machineKinds: ['fume-extractor'],
    instructions: 'Empty the bin into a sealed bag before it is two-thirds full. Wear the respiratory protection your site requires.',
    checklist: [
      check('ppe', 'Respirator and gloves on'),
      check('bagged', 'Dust bagged and sealed for disposal'),
      check('seal', 'Bin seal clean and bin clamped back'),
    ],
    estimatedMinutes: 15,
    responsibleRole: 'operator',
    requiresLockout: false,
    safetyCritical: false,
    triggers: [{ kind: 'calendar-fixed', rrule: 'FREQ=WEEKLY;BYDAY=FR', time: '13:00' }],
    dueSoonDays: 1,
    dueSoonFraction: 0,
    parts: [],
  },
  {
    key: 'electrode-nozzle',
    title: 'Check electrode pit and nozzle bore',
    machineKinds: ['torch', 'plasma-table', 'punch-plasma-cell'],
    instructions:
      'Switch off and lock out the plasma power source, let the torch cool, then take out the consumables. A worn electrode can blow out the nozzle: replace electrode and nozzle as a pair when the pit is near the limit.',
    checklist: [
      check('isolated', 'Plasma power source off and locked out; torch cool'),
      measure('pit', 'Electrode pit depth (air plasma, common practice limit about 1 mm)', 'mm', 0, 1),
      check('nozzle', 'Nozzle bore round, no gouging or double arcing marks'),
      check('swirl', 'Swirl ring clean and holes open'),
    ],
    estimatedMinutes: 10,
    responsibleRole: 'operator',
    requiresLockout: true,
    safetyCritical: false,
    triggers: [{ kind: 'meter', meter: ARC_STARTS, every: 800 }],
    dueSoonDays: 0,
    dueSoonFraction: 0.1,
    parts: [],
    // Changing electrode and nozzle at the station is this check done: the pit is measured as they come out.
    stationRecord: { kind: 'consumable-change', categories: ['electrode', 'nozzle'] },
  },
  {
    key: 'axis-lube',
    title: 'Grease ball screws and linear guides',
    machineKinds: ['punch-plasma-cell', 'plasma-table'],
    instructions: 'Isolate the machine, clean the grease points and apply the grease named on the lubrication chart until fresh grease shows at the seals.',
    checklist: [
      check('isolated', 'Machine isolated under the site procedure'),
      check('screws', 'X and Y ball screw nuts greased'),
      check('guides', 'All linear guide carriages greased'),
      check('wipers', 'Wipers intact; old grease wiped off'),
    ],
    estimatedMinutes: 40,
    responsibleRole: 'technician',
    requiresLockout: true,
    safetyCritical: false,
    triggers: [
      { kind: 'calendar-floating', every: 1, unit: 'month' },
      { kind: 'meter', meter: RUN_HOURS, every: 250 },
    ],
    dueSoonDays: 3,
    dueSoonFraction: 0.1,
    parts: [{ category: 'grease', quantity: 0.2 }],
  },
  {
    key: 'clamps',
    title: 'Inspect sheet clamps and clamp pads',
    machineKinds: ['punch-plasma-cell'],
    instructions: 'Isolate the machine. Check clamp jaws, pads and springs; a worn pad lets the sheet slip and spoils the part.',
    checklist: [
      check('isolated', 'Machine isolated under the site procedure'),
      check('pads', 'Clamp pads not worn through, no burrs'),
      check('springs', 'Clamps open fully and close evenly'),
      measure('gap', 'Jaw gap when closed on a 1 mm test strip', 'mm', 0, 0.1),
    ],
    estimatedMinutes: 20,
    responsibleRole: 'technician',
    requiresLockout: true,
    safetyCritical: false,
    triggers: [{ kind: 'calendar-fixed', rrule: 'FREQ=WEEKLY;BYDAY=MO', time: '06:30' }],
    dueSoonDays: 1,
    dueSoonFraction: 0,
    parts: [],
  },
  {
    key: 'tool-lube',
    title: 'Top up the punch tool lubrication reservoir',
    machineKinds: ['punch-plasma-cell', 'punch-head'],
    instructions: 'Fill the reservoir with the tool oil named on its label and check that oil reaches the punch on a test hit.',
    checklist: [measure('level', 'Reservoir level after topping up', '%', 50, 100), check('flow', 'Oil reaches the punch on a test hit')],
    estimatedMinutes: 5,
    responsibleRole: 'operator',
    requiresLockout: false,
    safetyCritical: false,
    triggers: [{ kind: 'calendar-fixed', rrule: 'FREQ=WEEKLY;BYDAY=MO,WE,FR', time: '06:00' }],
    dueSoonDays: 0,
    dueSoonFraction: 0,
    parts: [],
  },
  {
    key: 'punch-sharpen',
    title: 'Sharpen punches and check die clearance',
    machineKinds: ['punch-head', 'punch-plasma-cell'],
    instructions:
      'Sharpen the punches that did the most hits; take off only as much as the edge needs and record what was ground off. Check die clearance for the sheet thickness in use.',
    checklist: [
      check('isolated', 'Machine isolated before tools come out of the turret'),
      measure('ground', 'Material ground off the punch', 'mm', 0, 0.25),
      measure('length', 'Punch length left above the regrind limit', 'mm', 0),
      check('dies', 'Die edges checked; clearance suits the sheet thickness'),
    ],
    estimatedMinutes: 60,
    responsibleRole: 'technician',
    requiresLockout: true,
    safetyCritical: false,
    triggers: [{ kind: 'meter', meter: HITS, every: 30_000 }],
    dueSoonDays: 0,
    dueSoonFraction: 0.1,
    parts: [],
  },
  {
    key: 'cut-coupon',
    title: 'Cut and measure the weekly test coupon',
    machineKinds: ['plasma-table', 'punch-plasma-cell'],
    instructions: 'Cut the shop’s test coupon from the usual material and thickness, let it cool, and measure it against the shop tolerance.',
    checklist: [
      measure('width', 'Width deviation from nominal', 'mm', -0.2, 0.2),
      measure('bevel', 'Edge bevel angle', '°', 0, 3),
      check('dross', 'Dross comes off with light scraping'),
    ],
    estimatedMinutes: 20,
    responsibleRole: 'operator',
    requiresLockout: false,
    safetyCritical: false,
    triggers: [{ kind: 'calendar-fixed', rrule: 'FREQ=WEEKLY;BYDAY=TU', time: '07:00' }],
    dueSoonDays: 1,
    dueSoonFraction: 0,
    parts: [],
    stationRecord: { kind: 'cut-check' },
  },
  {
    key: 'torch-lead',
    title: 'Inspect torch lead, hoses and work clamp',
    machineKinds: ['torch', 'plasma-table', 'punch-plasma-cell'],
    instructions:
      'Switch off and lock out the plasma power source. Check the whole torch lead for cuts, burns and crushed sections, the gas hoses for leaks and the work clamp for a clean, tight contact.',
    checklist: [
      check('isolated', 'Plasma power source off and locked out'),
      check('lead', 'Torch lead jacket intact along its length'),
      check('hoses', 'Gas hoses and fittings free of leaks'),
      check('clamp', 'Work clamp clean and tight on the table'),
    ],
    estimatedMinutes: 20,
    responsibleRole: 'technician',
    requiresLockout: true,
    safetyCritical: true,
    triggers: [{ kind: 'calendar-floating', every: 1, unit: 'month' }],
    dueSoonDays: 3,
    dueSoonFraction: 0,
    parts: [],
  },
  {
    key: 'brake-guarding',
    title: 'Function-test press brake guarding',
    machineKinds: ['press-brake'],
    instructions:
      'With the machine powered and in setting mode, test the light curtain or laser guard and the emergency stops as the maker’s test sheet describes. Do not run production if any test fails.',
    checklist: [
      check('guard', 'Guard stops the beam when the test piece breaks it'),
      check('estops', 'Every emergency stop halts the beam and needs a reset'),
      check('footswitch', 'Foot switch cover and stop work'),
    ],
    estimatedMinutes: 15,
    responsibleRole: 'technician',
    requiresLockout: false,
    safetyCritical: true,
    triggers: [{ kind: 'calendar-fixed', rrule: 'FREQ=WEEKLY;BYDAY=MO', time: '06:00' }],
    dueSoonDays: 1,
    dueSoonFraction: 0,
    parts: [],
  },
];

export function findStarter(key: string): StarterPlan | undefined {
  return STARTER_PLANS.find((s) => s.key === key);
}
