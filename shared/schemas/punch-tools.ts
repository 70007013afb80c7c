import { z } from 'zod';
import { codeSchema } from './machines';
import { clock } from '../clock';
import { isoDateTime, oneLine } from './text';

/** Thick-turret station sizes as the trade names them (A smallest … E largest). */
export const STATION_SIZES = ['A', 'B', 'C', 'D', 'E'] as const;
export type StationSize = (typeof STATION_SIZES)[number];

export const punchToolInputSchema = z.object({
  machineId: z.uuid({ message: 'Choose the punch head or machine' }),
  hitsMeterId: z.uuid({ message: 'Choose the hits meter' }),
  code: codeSchema('tool'),
  name: oneLine(z.string({ message: 'Enter a name' }).trim().min(2, 'Enter a name').max(120, 'The name is too long (at most 120 characters)')),
  stationSize: z.enum(STATION_SIZES, { message: 'Choose a station size' }),
  sharpeningIntervalHits: z
    .number({ message: 'Enter the interval in hits' })
    .int('Whole hits')
    .min(100, 'At least 100 hits')
    .max(10_000_000, 'At most 10,000,000 hits'),
});
export type PunchToolInput = z.output<typeof punchToolInputSchema>;

export const punchToolUpdateSchema = z
  .object({
    name: oneLine(z.string().trim().min(2, 'Enter a name').max(120)).optional(),
    sharpeningIntervalHits: z.number({ message: 'Enter the interval in hits' }).int('Whole hits').min(100, 'At least 100 hits').max(10_000_000).optional(),
    active: z.boolean().optional(),
  })
  .refine((v) => Object.values(v).some((x) => x !== undefined), { message: 'Nothing to change' });

export const sharpeningSchema = z.object({
  sharpenedAt: isoDateTime('Not a valid time')
    .optional()
    .refine((v) => !v || new Date(v).getTime() <= clock.ms() + 5 * 60_000, 'The time lies in the future'),
  removedMm: z
    .number({ message: 'Enter the amount ground off in mm' })
    .min(0, 'Cannot be negative')
    .max(5, 'More than 5 mm is not plausible')
    .nullish()
    .transform((v) => v ?? null),
  note: z
    .string()
    .trim()
    .max(300)
    .nullish()
    .transform((v) => v || null),
});
export type SharpeningInput = z.output<typeof sharpeningSchema>;

export type PunchToolRow = {
  id: string;
  code: string;
  name: string;
  stationSize: StationSize;
  machineId: string;
  machineCode: string;
  hitsMeterId: string;
  sharpeningIntervalHits: number;
  lastSharpenedAt: string | null;
  hitsSince: number | null;
  fraction: number | null;
  /** Hits since sharpening reached the interval. */
  due: boolean;
  sharpenings: number;
  active: boolean;
};

export type SharpeningRow = {
  id: string;
  sharpenedAt: string;
  hitsReading: number;
  hitsSincePrevious: number;
  removedMm: number | null;
  by: string | null;
  note: string | null;
};
