import { z } from 'zod';
import { TORCH_CATEGORIES, type LifeUnit, type PartCategory, type TorchCategory } from './stock';
import type { MeterRow } from './machines';
import { clock } from '../clock';
import { isoDateTime, oneLine } from './text';

/**
 * Why a change was made, as one reason for the whole change. Kept for older clients and
 * imports: it is turned into a reason per part by `reasonsFromSingle` (shared/domain/consumables).
 */
export const CHANGE_REASONS = ['normal-wear', 'failed-start', 'poor-cut', 'damaged', 'preventive'] as const;
export type ChangeReason = (typeof CHANGE_REASONS)[number];

/** Why one part came out. Our own short labels. */
export const REMOVAL_REASONS = [
  'worn',
  'failed-start',
  'poor-cut',
  'damaged',
  'with-partner',
  'preventive',
  'gas-pressure',
  'moisture',
  'torch-height',
] as const;
export type RemovalReason = (typeof REMOVAL_REASONS)[number];
export const REMOVAL_REASON_LABELS: Record<RemovalReason, string> = {
  worn: 'Worn',
  'failed-start': 'Failed start',
  'poor-cut': 'Poor cut',
  damaged: 'Damaged',
  'with-partner': 'With its partner',
  preventive: 'Preventive',
  'gas-pressure': 'Gas pressure',
  moisture: 'Moisture in air',
  'torch-height': 'Torch height',
};
/**
 * How a removal counts in the life statistics:
 * - wear: the part's own life ended (a failure in the Weibull fit);
 * - suspension: the part still had life (changed with its partner, preventive, knocked) — right-censored;
 * - process: the process killed it (gas pressure, moisture, torch height) — not the part's wear,
 *   so also right-censored in the fit, and counted apart so the process gets fixed.
 */
export type RemovalKind = 'wear' | 'suspension' | 'process';
export const REMOVAL_REASON_KIND: Record<RemovalReason, RemovalKind> = {
  worn: 'wear',
  'failed-start': 'wear',
  'poor-cut': 'wear',
  damaged: 'suspension',
  'with-partner': 'suspension',
  preventive: 'suspension',
  'gas-pressure': 'process',
  moisture: 'process',
  'torch-height': 'process',
};
export const REMOVAL_KIND_LABELS: Record<RemovalKind, string> = { wear: 'Worn out', suspension: 'Still had life', process: 'Process fault' };

const optionalCounter = (label: string) =>
  z
    .number({ message: `Enter the ${label} as a number` })
    .min(0, `The ${label} cannot be negative`)
    .nullish()
    .transform((v) => v ?? null);

export const consumableChangeSchema = z
  .object({
    torchId: z.uuid({ message: 'Choose the torch' }),
    categories: z
      .array(z.enum(TORCH_CATEGORIES, { message: 'Not a torch consumable' }))
      .min(1, 'Choose at least one part')
      .max(TORCH_CATEGORIES.length),
    /** Part type per category; when left out, the same part as the one coming out. */
    partTypeIds: z.partialRecord(z.enum(TORCH_CATEGORIES), z.uuid({ message: 'Choose a part' })).default({}),
    /** Why each part came out; a part left out takes its reason from `reason`. */
    reasons: z.partialRecord(z.enum(TORCH_CATEGORIES), z.enum(REMOVAL_REASONS, { message: 'Choose why this part came out' })).default({}),
    /** One reason for the whole change (older clients); split per part by reasonsFromSingle. */
    reason: z.enum(CHANGE_REASONS, { message: 'Choose why the parts came out' }).optional(),
    /** Counters at the change; left out = the latest readings. */
    startsReading: optionalCounter('arc start count'),
    arcHoursReading: optionalCounter('arc hours'),
    /** The counter was reset or replaced, so the typed value may be lower than the last reading. */
    startsReset: z.boolean().default(false),
    arcHoursReset: z.boolean().default(false),
    changedAt: isoDateTime('Not a valid time')
      .optional()
      .refine((v) => !v || new Date(v).getTime() <= clock.ms() + 5 * 60_000, 'The change time lies in the future'),
    pitDepthMm: z
      .number({ message: 'Enter the pit depth in mm' })
      .min(0, 'The pit depth cannot be negative')
      .max(10, 'A pit deeper than 10 mm is not plausible')
      .nullish()
      .transform((v) => v ?? null),
    note: z
      .string()
      .trim()
      .max(500, 'The note is too long (at most 500 characters)')
      .nullish()
      .transform((v) => v || null),
    /** Off when the parts came from somewhere other than the shop's stock. */
    takeFromStock: z.boolean().default(true),
  })
  .superRefine((v, ctx) => {
    if (new Set(v.categories).size !== v.categories.length) ctx.addIssue({ code: 'custom', path: ['categories'], message: 'Each part only once' });
    for (const c of Object.keys(v.reasons))
      if (!v.categories.includes(c as TorchCategory))
        ctx.addIssue({ code: 'custom', path: ['reasons', c], message: 'A reason for a part that did not come out' });
    if (!v.reason)
      for (const c of v.categories) if (!v.reasons[c]) ctx.addIssue({ code: 'custom', path: ['reasons', c], message: 'Choose why this part came out' });
    if (v.pitDepthMm !== null && !v.categories.includes('electrode'))
      ctx.addIssue({ code: 'custom', path: ['pitDepthMm'], message: 'A pit depth belongs to an electrode change' });
  });
export type ConsumableChangeInput = z.output<typeof consumableChangeSchema>;

export type InstalledPart = {
  installId: string;
  category: TorchCategory;
  partType: { id: string; partNumber: string; name: string; lifeUnit: LifeUnit | null; expectedLife: number | null; onHand: number; stockUnit: string };
  installedAt: string;
  startsSince: number | null;
  arcHoursSince: number | null;
  /** Used life in the part's life unit, and its share of the expected (or recommended) life. */
  used: number | null;
  expected: number | null;
  expectedSource: 'recommended' | 'catalogue' | null;
  fraction: number | null;
  /** B10 and the cheapest change point of this part number over the shop's records, when there is a fit. */
  plan: { b10: number; failures: number; change: ChangePlan } | null;
};

export type CutCheckSummary = { id: string; checkedAt: string; passed: boolean; maxDeviationMm: number; toleranceMm: number; afterLastChange: boolean };

export type TorchStation = {
  id: string;
  code: string;
  name: string;
  startsMeter: MeterRow | null;
  arcHoursMeter: MeterRow | null;
  installed: InstalledPart[];
  lastChangeAt: string | null;
  latestCutCheck: CutCheckSummary | null;
  /** The latest coupon after the last change was out of tolerance. */
  suggestChange: boolean;
};

export type PartOption = { id: string; partNumber: string; name: string; category: PartCategory; onHand: number; stockUnit: string };

export type ToolSummary = {
  id: string;
  code: string;
  name: string;
  stationSize: string;
  hitsSince: number | null;
  interval: number;
  fraction: number | null;
  due: boolean;
};

export type ChangeRow = {
  id: string;
  changedAt: string;
  torchCode: string;
  /** Parts put in, with why the one they replaced came out (null when nothing was in that position). */
  parts: { category: TorchCategory; partNumber: string; reason: RemovalReason | null; lifeStarts: number | null; lifeArcHours: number | null }[];
  startsReading: number | null;
  arcHoursReading: number | null;
  pitDepthMm: number | null;
  by: string | null;
  hasPhoto: boolean;
  note: string | null;
  /** Scheduled work this change did (its plan names a consumable change of these parts). */
  workOrders: { id: string; number: number; title: string }[];
};

export type ReferenceValue = { value: number; unit: string; source: string; overridden: boolean };

export type StationLockout = {
  id: string;
  machineCode: string;
  state: 'locked' | 'verified' | 'testing' | 'reapplied';
  appliedAt: string;
  reason: string;
  heldBy: string;
  /** Set when the lockout reaches this machine through a shared isolation point on another machine (e.g. "H1-E2"); heldBy is then whose lock is on it. */
  sharedPoint?: string;
};
/** A counter that rose while the machine was locked out: shown at the machine until the lockout ends (and a week after). */
export type StationAlarm = { id: string; machineCode: string; at: string; reason: string; lockoutId: string | null };
export type StationDueRow = {
  id: string;
  number: number;
  machineCode: string;
  title: string;
  status: 'open' | 'in-progress' | 'on-hold';
  dueAt: string | null;
  overdue: boolean;
  requiresLockout: boolean;
};

export type StationView = {
  machine: { id: string; code: string; name: string; kind: string; location: string | null };
  torches: TorchStation[];
  meters: MeterRow[];
  tools: ToolSummary[];
  partOptions: PartOption[];
  recentChanges: ChangeRow[];
  /** Lockouts not yet released on the machine or its components. */
  lockouts: StationLockout[];
  /** Open work orders on the machine or its components, soonest due first. */
  due: StationDueRow[];
  /** Alarms raised on the machine: counters that advanced during a verified lockout. */
  alarms: StationAlarm[];
  reference: { pitLimitMm: ReferenceValue; cutToleranceMm: ReferenceValue; changeReliability: ReferenceValue };
};

// ── Site settings for consumables ────────────────────────────────────────────
export const consumableSettingsSchema = z
  .object({
    cutToleranceMm: z.number({ message: 'Enter the tolerance in mm' }).gt(0, 'The tolerance must be above zero').max(5, 'At most 5 mm').nullable().optional(),
    electrodePitLimitMm: z.number({ message: 'Enter the pit depth in mm' }).gt(0, 'The limit must be above zero').max(5, 'At most 5 mm').nullable().optional(),
    changeTargetReliability: z
      .number({ message: 'Enter a share between 0.5 and 0.99' })
      .min(0.5, 'Between 0.5 and 0.99')
      .max(0.99, 'Between 0.5 and 0.99')
      .nullable()
      .optional(),
  })
  .refine((v) => Object.values(v).some((x) => x !== undefined), { message: 'Nothing to change' });
export type ConsumableSettingsInput = z.output<typeof consumableSettingsSchema>;

// ── Cut-quality checks ───────────────────────────────────────────────────────
export const cutCheckSchema = z.object({
  torchId: z.uuid({ message: 'Choose the torch' }),
  checkedAt: isoDateTime('Not a valid time').optional(),
  dimensions: z
    .array(
      z.object({
        label: oneLine(z.string().trim().min(1, 'Name the dimension').max(40, 'At most 40 characters')),
        nominalMm: z.number({ message: 'Enter the nominal size in mm' }).positive('The nominal size must be above zero').max(10_000),
        measuredMm: z.number({ message: 'Enter the measured size in mm' }).positive('The measured size must be above zero').max(10_000),
      }),
    )
    .min(1, 'Enter at least one measured dimension')
    .max(12, 'At most 12 dimensions'),
  note: z
    .string()
    .trim()
    .max(500)
    .nullish()
    .transform((v) => v || null),
});
export type CutCheckInput = z.output<typeof cutCheckSchema>;

export type CutCheckRow = {
  id: string;
  checkedAt: string;
  torchCode: string;
  toleranceMm: number;
  dimensions: { label: string; nominalMm: number; measuredMm: number; deviationMm: number; within: boolean }[];
  maxDeviationMm: number;
  passed: boolean;
  installedParts: { category: string; partNumber: string }[];
  by: string | null;
  note: string | null;
  /** Scheduled work this coupon did (its plan names a test coupon). */
  workOrders: { id: string; number: number; title: string }[];
};

// ── Life statistics ─────────────────────────────────────────────────────────
export const lifeStatsQuery = z.object({
  partTypeId: z.uuid({ message: 'Choose a part' }),
  machineId: z.uuid().optional(),
});

/** The cheapest planned change age against a failure in service (age replacement), or why there is none. */
export type ChangePlan = {
  plannedCost: number;
  failureCost: number | null;
  age: number | null;
  /** Cost per unit of life (per start or per arc hour) at that age, and when running to failure. */
  costRate: number | null;
  runToFailureCostRate: number | null;
  savingPercent: number | null;
  note: string | null;
};

export type LifeFit = {
  shape: number;
  scale: number;
  meanLife: number;
  b10: number;
  recommended: number;
  targetReliability: number;
  bounds: {
    level: number;
    method: 'fisher-matrix';
    shape: { lower: number; upper: number };
    scale: { lower: number; upper: number };
    b10: { lower: number; upper: number };
  } | null;
  plan: ChangePlan;
  curve: { life: number; reliability: number }[];
};

export type LifeStats = {
  partType: {
    id: string;
    partNumber: string;
    name: string;
    category: PartCategory;
    lifeUnit: LifeUnit | null;
    unitCost: number;
    plannedChangeCost: number | null;
    failureCost: number | null;
    expectedLife: number | null;
  };
  unit: 'starts' | 'arc-hours';
  failures: number[];
  suspensions: number[];
  stillInstalled: number;
  /** Removals by reason, process faults among them. */
  byReason: { reason: RemovalReason; kind: RemovalKind; count: number }[];
  processFaults: number;
  histogram: { from: number; to: number; failures: number; suspensions: number }[];
  fit: LifeFit | null;
  fitProblem: string | null;
  /** Set when the fit rests on fewer than 10 worn-out parts. */
  warning: string | null;
  meanLife: number | null;
  /** Σ unit cost of removed parts / Σ their arc hours. */
  costPerArcHour: number | null;
  perMachine: { machineId: string; machineCode: string; removed: number; meanLife: number | null; costPerArcHour: number | null }[];
};
