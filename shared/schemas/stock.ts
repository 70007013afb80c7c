import { z } from 'zod';
import { oneLine } from './text';

export const PART_CATEGORIES = [
  'electrode',
  'nozzle',
  'swirl-ring',
  'shield',
  'retaining-cap',
  'punch',
  'die',
  'stripper',
  'hydraulic-filter',
  'extractor-cartridge',
  'oil',
  'grease',
  'other',
] as const;
export type PartCategory = (typeof PART_CATEGORIES)[number];

/** What wears a part out, i.e. the unit its life is counted in. */
export const LIFE_UNITS = ['starts', 'arc-hours', 'hits', 'hours', 'days'] as const;
export type LifeUnit = (typeof LIFE_UNITS)[number];

export const STOCK_MOVE_KINDS = ['received', 'used', 'adjusted'] as const;
export type StockMoveKind = (typeof STOCK_MOVE_KINDS)[number];

export const stockMoveSchema = z.object({
  partTypeId: z.uuid({ message: 'Choose a part' }),
  kind: z.enum(STOCK_MOVE_KINDS),
  /** Signed change in stock units: + received, − used; adjustments either way. */
  quantity: z
    .number({ message: 'Enter a quantity' })
    .finite()
    .refine((q) => q !== 0, 'The quantity cannot be zero'),
  reason: z.string().trim().max(300).optional(),
});
export type StockMoveInput = z.infer<typeof stockMoveSchema>;

export const PART_CATEGORY_LABELS: Record<PartCategory, string> = {
  electrode: 'Electrode',
  nozzle: 'Nozzle',
  'swirl-ring': 'Swirl ring',
  shield: 'Shield',
  'retaining-cap': 'Retaining cap',
  punch: 'Punch',
  die: 'Die',
  stripper: 'Stripper',
  'hydraulic-filter': 'Hydraulic filter',
  'extractor-cartridge': 'Extractor cartridge',
  oil: 'Oil',
  grease: 'Grease',
  other: 'Other',
};
export const LIFE_UNIT_LABELS: Record<LifeUnit, string> = {
  starts: 'arc starts',
  'arc-hours': 'arc hours',
  hits: 'hits',
  hours: 'running hours',
  days: 'days',
};
/** Torch consumables, in the order they sit on the torch from the inside out. */
export const TORCH_CATEGORIES = ['electrode', 'swirl-ring', 'nozzle', 'retaining-cap', 'shield'] as const satisfies readonly PartCategory[];
export type TorchCategory = (typeof TORCH_CATEGORIES)[number];

const money = z.number({ message: 'Enter a cost' }).min(0, 'A cost cannot be negative').max(1_000_000, 'That cost is implausibly high');

const optionalMoney = money.nullable().default(null);

/** A failure in service must cost more than a planned change, or no change age is the cheapest. */
export function failureCostProblem(plannedCost: number, failureCost: number | null): string | null {
  return failureCost !== null && failureCost <= plannedCost
    ? `A failure in service must cost more than a planned change (${plannedCost}); otherwise there is no cheapest change point`
    : null;
}

const partTypeFields = z.object({
  partNumber: oneLine(
    z.string({ message: 'Enter a part number' }).trim().min(1, 'Enter a part number').max(60, 'The part number is too long (at most 60 characters)'),
  ),
  name: oneLine(z.string({ message: 'Enter a name' }).trim().min(2, 'Enter a name').max(160, 'The name is too long (at most 160 characters)')),
  category: z.enum(PART_CATEGORIES, { message: 'Choose a category' }),
  stockUnit: oneLine(z.string().trim().min(1, 'Enter the unit stock is counted in').max(16)).default('pcs'),
  lifeUnit: z.enum(LIFE_UNITS, { message: 'Choose what wears it out' }).nullable().default(null),
  expectedLife: z.number({ message: 'Enter the expected life as a number' }).positive('The expected life must be above zero').nullable().default(null),
  unitCost: money.default(0),
  /** Cost of a planned change (part and fitting time); empty = the unit cost. */
  plannedChangeCost: optionalMoney,
  /** Cost of a failure in service: the part, scrapped sheet, damaged torch parts, downtime. */
  failureCost: optionalMoney,
  leadTimeDays: z.number({ message: 'Enter the lead time in days' }).int('Whole days').min(0, 'The lead time cannot be negative').max(365, 'At most 365 days'),
  serviceLevel: z.number().gt(0.5, 'Between 0.5 and 0.999').lt(1, 'Between 0.5 and 0.999').default(0.95),
  /** Stock counted when the part is first entered; recorded as an adjustment, never written over on-hand. */
  openingStock: z.number({ message: 'Enter the opening stock as a number' }).min(0, 'Stock cannot be negative').default(0),
});
export const partTypeInputSchema = partTypeFields.superRefine((v, ctx) => {
  if ((v.failureCost ?? 0) < 0 || (v.plannedChangeCost ?? 0) < 0) return; // already refused on its own field
  const problem = failureCostProblem(v.plannedChangeCost ?? v.unitCost, v.failureCost);
  if (problem) ctx.addIssue({ code: 'custom', path: ['failureCost'], message: problem });
});
export type PartTypeInput = z.output<typeof partTypeInputSchema>;

/** A change to a part; the failure cost is checked against the planned cost in the service, which knows the stored values. */
const { openingStock: _opening, ...editable } = partTypeFields.shape;
/** The same fields without their defaults: a field left out of a change stays as it is (a default would overwrite it). */
const withoutDefaults = Object.fromEntries(Object.entries(editable).map(([k, v]) => [k, (v instanceof z.ZodDefault ? v.unwrap() : v).optional()])) as {
  [K in keyof typeof editable]: z.ZodOptional<(typeof editable)[K] extends z.ZodDefault<infer T> ? T : (typeof editable)[K]>;
};
export const partTypeUpdateSchema = z
  .object(withoutDefaults)
  .extend({ active: z.boolean().optional() })
  .refine((v) => Object.values(v).some((x) => x !== undefined), { message: 'Nothing to change' });
export type PartTypeUpdate = z.output<typeof partTypeUpdateSchema>;

/** A move typed in on the stock page: the sign must fit the kind; adjustments need a reason. */
export const recordStockMoveSchema = stockMoveSchema.superRefine((v, ctx) => {
  if (v.kind === 'received' && v.quantity < 0) ctx.addIssue({ code: 'custom', path: ['quantity'], message: 'A receipt adds stock: enter a positive quantity' });
  if (v.kind === 'used' && v.quantity > 0) ctx.addIssue({ code: 'custom', path: ['quantity'], message: 'Use takes stock out: enter a negative quantity' });
  if (v.kind === 'adjusted' && !v.reason) ctx.addIssue({ code: 'custom', path: ['reason'], message: 'Say why the count is adjusted (e.g. stocktake)' });
});
export type RecordStockMoveInput = z.output<typeof recordStockMoveSchema>;

export const listPartTypesQuery = z.object({
  lowOnly: z
    .enum(['true', 'false'])
    .optional()
    .transform((v) => v === 'true'),
  includeInactive: z
    .enum(['true', 'false'])
    .optional()
    .transform((v) => v === 'true'),
});

export type PartTypeRow = {
  id: string;
  partNumber: string;
  name: string;
  category: PartCategory;
  stockUnit: string;
  lifeUnit: LifeUnit | null;
  expectedLife: number | null;
  unitCost: number;
  plannedChangeCost: number | null;
  failureCost: number | null;
  /** ISO 4217 code from the shop's settings, or null when none is set. */
  currency: string | null;
  onHand: number;
  leadTimeDays: number;
  serviceLevel: number;
  active: boolean;
  /** Mean and standard deviation of daily use over the usage window. */
  usagePerDay: number;
  usageSdPerDay: number;
  usageWindowDays: number;
  /** reorderPointUnits from shared/domain/stock.ts. */
  reorderPoint: number;
  low: boolean;
};

export type StockMoveRow = {
  id: string;
  at: string;
  kind: StockMoveKind;
  quantity: number;
  onHandAfter: number;
  reason: string | null;
  by: string | null;
  refType: string | null;
};
