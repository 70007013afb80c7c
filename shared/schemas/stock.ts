import { z } from 'zod';

export const PART_CATEGORIES = ['electrode', 'nozzle', 'swirl-ring', 'shield', 'retaining-cap', 'punch', 'die', 'stripper', 'hydraulic-filter', 'extractor-cartridge', 'oil', 'grease', 'other'] as const;
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
  quantity: z.number({ message: 'Enter a quantity' }).finite().refine((q) => q !== 0, 'The quantity cannot be zero'),
  reason: z.string().trim().max(300).optional(),
});
export type StockMoveInput = z.infer<typeof stockMoveSchema>;
