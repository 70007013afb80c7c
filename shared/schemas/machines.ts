import { z } from 'zod';
import { clock } from '../clock';
import { isOneLineText, isoDateTime, oneLine, ONE_LINE_MESSAGE } from './text';
import type { MachineStatus } from './machine-state';

export const MACHINE_KINDS = ['punch-plasma-cell', 'plasma-table', 'press-brake', 'hydraulic-unit', 'fume-extractor', 'torch', 'punch-head', 'other'] as const;
export type MachineKind = (typeof MACHINE_KINDS)[number];
export const MACHINE_KIND_LABELS: Record<MachineKind, string> = {
  'punch-plasma-cell': 'Punch/plasma cell',
  'plasma-table': 'Plasma table',
  'press-brake': 'Press brake',
  'hydraulic-unit': 'Hydraulic unit',
  'fume-extractor': 'Fume extractor',
  torch: 'Plasma torch',
  'punch-head': 'Punch head',
  other: 'Other',
};

/** Meter kinds: counts and running time only go up (unless reset); condition readings move both ways. */
export const METER_KINDS = ['count', 'running-time', 'condition'] as const;
export type MeterKind = (typeof METER_KINDS)[number];

/** Units a meter may use, by kind. Stored with every meter and shown beside every value. */
export const METER_UNITS: Record<MeterKind, readonly string[]> = {
  count: ['starts', 'hits', 'cycles'],
  'running-time': ['h'],
  condition: ['Pa', 'kPa', 'bar', 'psi', 'inH2O', '°C', '°F', 'mm'],
};

/** The unit a meter form shows after its kind changes: the chosen unit while the kind allows it, else the kind's first (“h” for running time). */
export function unitForKind(kind: MeterKind, unit: string | undefined): string {
  const units = METER_UNITS[kind] ?? [];
  return unit !== undefined && units.includes(unit) ? unit : (units[0] ?? '');
}

/** Empty form fields become null so optional columns are cleared, not filled with ''. */
const optionalText = (max: number, label: string) =>
  z
    .string()
    .trim()
    .max(max, `${label} is too long (at most ${max} characters)`)
    .nullish()
    .transform((v) => (v ? v : null));

/** Codes go on QR labels and in CSV files: short, no spaces. */
export const codeSchema = (what: string) =>
  z
    .string({ message: `Enter a ${what} code` })
    .trim()
    .min(1, `Enter a ${what} code`)
    .max(40, `The ${what} code is too long (at most 40 characters)`)
    .refine(isOneLineText, ONE_LINE_MESSAGE)
    .regex(/^[A-Za-z0-9][A-Za-z0-9._-]*$/, 'Use letters, digits, dot, dash or underscore, no spaces');

export const machineInputSchema = z.object({
  code: codeSchema('machine'),
  name: oneLine(z.string({ message: 'Enter a name' }).trim().min(2, 'Enter a name').max(120, 'The name is too long (at most 120 characters)')),
  kind: z.enum(MACHINE_KINDS, { message: 'Choose a kind of machine' }),
  /** Set for a component (the torch of a cell, its punch head …). */
  parentId: z
    .uuid({ message: 'Choose a machine from the list' })
    .nullish()
    .transform((v) => v ?? null),
  location: optionalText(120, 'Location'),
  serial: optionalText(80, 'Serial number'),
  notes: optionalText(2000, 'Notes'),
});
export type MachineInput = z.output<typeof machineInputSchema>;

export const machineUpdateSchema = machineInputSchema
  .partial()
  .extend({ active: z.boolean().optional() })
  .refine((v) => Object.values(v).some((x) => x !== undefined), { message: 'Nothing to change' });
export type MachineUpdate = z.output<typeof machineUpdateSchema>;

export const machineCodeParam = z.object({ code: codeSchema('machine') });

export type MachineRow = {
  id: string;
  code: string;
  name: string;
  kind: MachineKind;
  parentId: string | null;
  location: string | null;
  serial: string | null;
  notes: string | null;
  active: boolean;
  /** Depth in the component tree (0 = top-level machine), in tree order. */
  depth: number;
  meterCount: number;
  /** In service, out of service or locked out, since when and why. */
  status: MachineStatus;
};

export type LatestReading = { value: number; readAt: string; isReset: boolean };

export type MeterRow = {
  id: string;
  machineId: string;
  machineCode: string;
  code: string;
  name: string;
  kind: MeterKind;
  unit: string;
  lowerLimit: number | null;
  upperLimit: number | null;
  latest: LatestReading | null;
};

export type MachineDetail = MachineRow & {
  parent: { id: string; code: string; name: string } | null;
  /** Components below this machine, in tree order, depth relative to it. */
  components: MachineRow[];
  /** Meters of this machine and of its components. */
  meters: MeterRow[];
};

// ── Meters and readings ────────────────────────────────────────────────────────

const finite = (label: string) => z.number({ message: `Enter ${label} as a number` }).refine(Number.isFinite, `${label} must be a finite number`);

export const meterInputSchema = z
  .object({
    machineId: z.uuid({ message: 'Choose a machine' }),
    code: codeSchema('meter'),
    name: oneLine(z.string({ message: 'Enter a name' }).trim().min(2, 'Enter a name').max(120, 'The name is too long (at most 120 characters)')),
    kind: z.enum(METER_KINDS, { message: 'Choose a kind of meter' }),
    unit: z.string({ message: 'Choose a unit' }).min(1, 'Choose a unit'),
    lowerLimit: finite('the lower limit')
      .nullish()
      .transform((v) => v ?? null),
    upperLimit: finite('the upper limit')
      .nullish()
      .transform((v) => v ?? null),
  })
  .superRefine((v, ctx) => {
    const units = METER_UNITS[v.kind];
    if (units && !units.includes(v.unit)) {
      ctx.addIssue({ code: 'custom', path: ['unit'], message: `A ${v.kind} meter counts in ${units.join(', ')}; “${v.unit}” is not one of them` });
    }
    if (v.kind !== 'condition' && (v.lowerLimit !== null || v.upperLimit !== null)) {
      ctx.addIssue({ code: 'custom', path: ['upperLimit'], message: 'Only condition meters have alarm limits' });
    }
    if (v.lowerLimit !== null && v.upperLimit !== null && v.lowerLimit >= v.upperLimit) {
      ctx.addIssue({ code: 'custom', path: ['upperLimit'], message: 'The upper limit must be above the lower limit' });
    }
  });
export type MeterInput = z.output<typeof meterInputSchema>;

export const meterUpdateSchema = z
  .object({
    name: oneLine(z.string().trim().min(2, 'Enter a name').max(120, 'The name is too long (at most 120 characters)')).optional(),
    lowerLimit: finite('the lower limit').nullable().optional(),
    upperLimit: finite('the upper limit').nullable().optional(),
  })
  .refine((v) => Object.values(v).some((x) => x !== undefined), { message: 'Nothing to change' });
export type MeterUpdate = z.output<typeof meterUpdateSchema>;

/** A typed-in reading. `readAt` defaults to now; it may not lie in the future. */
export const readingInputSchema = z.object({
  value: z.coerce.number({ message: 'Enter the reading as a number' }).refine(Number.isFinite, 'Enter the reading as a number'),
  readAt: isoDateTime('Enter the time as an ISO date-time, e.g. 2026-03-14T07:30:00Z')
    .optional()
    .refine((v) => !v || new Date(v).getTime() <= clock.ms() + 5 * 60_000, 'The reading time lies in the future'),
  isReset: z.boolean().default(false),
  note: optionalText(300, 'Note'),
  /** The unit the value was read in, when not the meter's own: converted on entry (shared/domain/units.ts, NIST SP 811). */
  unit: z.string().trim().max(16, 'Unit: at most 16 characters').optional(),
});
export type ReadingInput = z.output<typeof readingInputSchema>;

export const listReadingsQuery = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(25),
  dir: z.enum(['asc', 'desc']).default('desc'),
});
export type ListReadingsQuery = z.output<typeof listReadingsQuery>;

export const trendQuery = z.object({ days: z.coerce.number().int().min(1).max(3660).default(365) });

export type ReadingRow = {
  id: string;
  value: number;
  readAt: string;
  isReset: boolean;
  source: 'manual' | 'import' | 'work-order' | 'consumable-change';
  note: string | null;
  recordedBy: string | null;
};

export type TrendPoint = { at: string; value: number; isReset: boolean };
export type MeterTrend = {
  meter: MeterRow;
  points: TrendPoint[];
  /** Usage per calendar day over the forecast window (the due engine's rate). */
  ratePerDay: number | null;
  rate: { spanDays: number; readings: number; provisional: boolean; windowDays: number } | null;
};

/** Several counters read at one moment (the station page's "Record counters"): all or none. */
export const readingBatchSchema = z.object({
  readAt: readingInputSchema.shape.readAt,
  readings: z
    .array(z.object({ meterId: z.uuid({ message: 'Choose a meter' }), value: readingInputSchema.shape.value, isReset: z.boolean().default(false) }))
    .min(1, 'Enter at least one reading')
    .max(50, 'At most 50 readings at once'),
  /** Keep the readings that are fine when another one is refused (the station form); default: all or none. */
  keepValid: z.boolean().default(false),
});
/** What a batch kept and, with keepValid, which readings it refused and why. */
export type ReadingBatchResult = { ids: string[]; kept: string[]; refused: { path: string; meterId: string; message: string }[] };
export type ReadingBatchInput = z.output<typeof readingBatchSchema>;

/** Fields sent beside a machine photo (multipart). */
export const machinePhotoFields = z.object({
  caption: z
    .string()
    .trim()
    .max(200, 'Caption: at most 200 characters')
    .optional()
    .transform((v) => (v ? v : null)),
});
export const machinePhotoParams = z.object({ id: z.uuid(), photoId: z.uuid() });
export type MachinePhotoRow = { id: string; caption: string | null; mimeType: string; byteSize: number; createdAt: string; uploadedBy: string | null };
