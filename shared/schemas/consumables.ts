import { z } from 'zod';
import { TORCH_CATEGORIES, type LifeUnit, type PartCategory, type TorchCategory } from './stock';
import type { MeterRow } from './machines';
import { clock } from '../clock';
import { isoDateTime, oneLine } from './text';

/** Why a consumable came out. Our own labels; the first three mean the part reached the end of its life. */
export const CHANGE_REASONS = ['normal-wear', 'failed-start', 'poor-cut', 'damaged', 'preventive'] as const;
export type ChangeReason = (typeof CHANGE_REASONS)[number];
export const CHANGE_REASON_LABELS: Record<ChangeReason, string> = {
  'normal-wear': 'Normal wear',
  'failed-start': 'Failed start / blow-out',
  'poor-cut': 'Poor cut quality',
  damaged: 'Damaged',
  preventive: 'Preventive',
};
/**
 * Removals that end a part's life by wear count as failures in the life statistics;
 * damaged (an accident, not wear) and preventive (still working) are suspensions.
 */
export const WEAR_OUT_REASONS: readonly ChangeReason[] = ['normal-wear', 'failed-start', 'poor-cut'];

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
    reason: z.enum(CHANGE_REASONS, { message: 'Choose why the parts came out' }),
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
  reason: ChangeReason;
  parts: { category: TorchCategory; partNumber: string; lifeStarts: number | null; lifeArcHours: number | null }[];
  startsReading: number | null;
  arcHoursReading: number | null;
  pitDepthMm: number | null;
  by: string | null;
  hasPhoto: boolean;
  note: string | null;
};

export type ReferenceValue = { value: number; unit: string; source: string; overridden: boolean };

export type StationLockout = { id: string; machineCode: string; state: 'locked' | 'verified'; appliedAt: string; reason: string; heldBy: string };
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
};

// ── Life statistics ─────────────────────────────────────────────────────────
export const lifeStatsQuery = z.object({
  partTypeId: z.uuid({ message: 'Choose a part' }),
  machineId: z.uuid().optional(),
});

export type LifeStats = {
  partType: { id: string; partNumber: string; name: string; category: PartCategory; lifeUnit: LifeUnit | null; unitCost: number; expectedLife: number | null };
  unit: 'starts' | 'arc-hours';
  failures: number[];
  suspensions: number[];
  stillInstalled: number;
  histogram: { from: number; to: number; failures: number; suspensions: number }[];
  fit: { shape: number; scale: number; b10: number; recommended: number; targetReliability: number; curve: { life: number; reliability: number }[] } | null;
  fitProblem: string | null;
  meanLife: number | null;
  /** Σ unit cost of removed parts / Σ their arc hours. */
  costPerArcHour: number | null;
  perMachine: { machineId: string; machineCode: string; removed: number; meanLife: number | null; costPerArcHour: number | null }[];
};
