import { z } from 'zod';
import { ISO_VG_GRADES } from '../domain/viscosity';
import { paging } from './paging';
import { isoDateTime, oneLine } from './text';

const count = (size: string) =>
  z
    .number({ message: `Enter the count at ≥${size} µm(c)` })
    .finite()
    .min(0, 'Counts cannot be negative')
    .max(1e9);

/** One laboratory (or on-site counter) result for a hydraulic unit's oil sample. */
export const oilAnalysisInput = z
  .object({
    machineId: z.uuid({ message: 'Choose a hydraulic unit' }),
    sampledAt: isoDateTime('Enter when the sample was taken'),
    labReference: oneLine(z.string().trim().max(80)).optional(),
    /** Particles per mL at ≥4, ≥6, ≥14 µm(c) (ISO 4406 sizes, ISO 11171 calibration). */
    ge4um: count('4'),
    ge6um: count('6'),
    ge14um: count('14'),
    viscosity40: z.number().finite().positive('Viscosity must be greater than 0').max(10_000).nullable().default(null),
    waterPpm: z.number().finite().min(0, 'Cannot be negative').max(1_000_000).nullable().default(null),
    temperatureC: z.number().finite().min(-40).max(200).nullable().default(null),
    notes: z.string().trim().max(2000).optional(),
  })
  .refine((v) => v.ge6um <= v.ge4um, { path: ['ge6um'], message: 'The ≥6 µm count cannot exceed the ≥4 µm count (counts are cumulative)' })
  .refine((v) => v.ge14um <= v.ge6um, { path: ['ge14um'], message: 'The ≥14 µm count cannot exceed the ≥6 µm count (counts are cumulative)' });
export type OilAnalysisInput = z.infer<typeof oilAnalysisInput>;

export const oilTargetInput = z.object({
  targetCode: z
    .string()
    .trim()
    .regex(/^\d{1,2}\/\d{1,2}\/\d{1,2}$/, 'Write the target as three scale numbers, e.g. 17/15/12'),
  vgGrade: z
    .number()
    .int()
    .refine((g) => ISO_VG_GRADES.includes(g), 'Choose a standard ISO VG grade'),
  waterLimitPpm: z.number().finite().positive('Must be greater than 0').max(100_000).default(500),
  temperatureLimitC: z.number().finite().min(0).max(150).nullable().default(60),
});
export type OilTargetInput = z.infer<typeof oilTargetInput>;

export const OIL_SORTS = ['sampledAt', 'unit', 'viscosity40', 'waterPpm', 'temperatureC'] as const;
export const listOilAnalysesQuery = paging.extend({
  machineId: z.uuid().optional(),
  sort: z.enum(OIL_SORTS, { message: `Sort by one of: ${OIL_SORTS.join(', ')}` }).default('sampledAt'),
  dir: z.enum(['asc', 'desc'], { message: 'Direction is asc or desc' }).default('desc'),
});
export type ListOilAnalysesQuery = z.infer<typeof listOilAnalysesQuery>;

export type OilTarget = OilTargetInput & { machineId: string };

export type OilFinding = { field: 'cleanliness' | 'viscosity' | 'water' | 'temperature'; message: string; severity: 'danger' | 'caution' };

export type OilAnalysisRow = {
  id: string;
  machine: { id: string; code: string; name: string };
  sampledAt: string;
  labReference: string | null;
  ge4um: number;
  ge6um: number;
  ge14um: number;
  isoCode: string;
  targetCode: string | null;
  viscosity40: number | null;
  vgGrade: number | null;
  viscosityBand: string | null;
  waterPpm: number | null;
  temperatureC: number | null;
  outOfLimits: boolean;
  findings: OilFinding[];
  workOrder: { id: string; number: number } | null;
};

export type HydraulicUnitView = {
  id: string;
  code: string;
  name: string;
  target: OilTarget | null;
  latest: OilAnalysisRow | null;
};
