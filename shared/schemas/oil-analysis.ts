import { z } from 'zod';
import { DEFAULT_VISCOSITY_LIMITS, ISO_VG_GRADES } from '../domain/viscosity';
import { DEFAULT_CLEANLINESS_STEPS, parseIso4406Code } from '../domain/cleanliness';
import { clock } from '../clock';
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
    // A sample dated ahead would stay the "latest" result and hide newer ones; a minute's slack for clocks.
    sampledAt: isoDateTime('Enter when the sample was taken').refine((v) => Date.parse(v) <= clock.ms() + 60_000, 'The sample cannot be taken in the future'),
    labReference: oneLine(z.string().trim().max(80)).optional(),
    /** Particles per mL at ≥4, ≥6, ≥14 µm(c) (ISO 4406 sizes, ISO 11171 calibration). */
    ge4um: count('4'),
    ge6um: count('6'),
    ge14um: count('14'),
    viscosity40: z.number().finite().positive('Viscosity must be greater than 0').max(10_000).nullable().default(null),
    waterPpm: z.number().finite().min(0, 'Cannot be negative').max(1_000_000).nullable().default(null),
    /** Oil temperature when the sample was drawn: shown beside the result, not judged (it describes the moment, not the oil). */
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
    .superRefine((c, ctx) => {
      if (!/^(\d{1,2}|-)\/(\d{1,2}|-)\/(\d{1,2}|-)$/.test(c)) {
        ctx.addIssue({ code: 'custom', message: 'Write the target as three scale numbers, e.g. 17/15/12 (a dash for a size not judged: -/15/12)' });
        return;
      }
      try {
        parseIso4406Code(c);
      } catch {
        ctx.addIssue({ code: 'custom', message: 'Not a usable ISO 4406 code: numbers 0–28 that do not grow with size, at least one of them given' });
      }
    }),
  /** The oil's viscosity at 40 °C as delivered (mm²/s); used oil is judged against it. Null: the grade's mid-point stands in. */
  baselineViscosityCst: z.number().finite().positive('Must be greater than 0').max(10_000).nullable().default(null),
  vgGrade: z
    .number()
    .int()
    .refine((g) => ISO_VG_GRADES.includes(g), 'Choose a standard ISO VG grade'),
  waterLimitPpm: z.number().finite().positive('Must be greater than 0').max(100_000).default(500),
  /** Kept for stored targets; oil temperature at sampling is shown, not judged. */
  temperatureLimitC: z.number().finite().min(0).max(150).nullable().default(null),
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

/** Shop-wide thresholds for the oil verdicts (defaults common practice; see shared/domain/cleanliness.ts and viscosity.ts). */
export const oilVerdictSettings = z
  .object({
    cleanlinessCautionSteps: z.number().int('Whole steps').min(1, 'At least 1 step').max(10, 'At most 10 steps'),
    cleanlinessActionSteps: z.number().int('Whole steps').min(1, 'At least 1 step').max(10, 'At most 10 steps'),
    viscosityCautionPercent: z.number().finite().positive('Must be greater than 0').max(100, 'At most 100 %'),
    viscosityActionPercent: z.number().finite().positive('Must be greater than 0').max(100, 'At most 100 %'),
  })
  .refine((v) => v.cleanlinessActionSteps >= v.cleanlinessCautionSteps, { path: ['cleanlinessActionSteps'], message: 'Action cannot come before caution' })
  .refine((v) => v.viscosityActionPercent >= v.viscosityCautionPercent, { path: ['viscosityActionPercent'], message: 'Action cannot come before caution' });
export type OilVerdictSettings = z.infer<typeof oilVerdictSettings>;
export const DEFAULT_OIL_VERDICT_SETTINGS: OilVerdictSettings = {
  cleanlinessCautionSteps: DEFAULT_CLEANLINESS_STEPS.caution,
  cleanlinessActionSteps: DEFAULT_CLEANLINESS_STEPS.action,
  viscosityCautionPercent: DEFAULT_VISCOSITY_LIMITS.cautionPercent,
  viscosityActionPercent: DEFAULT_VISCOSITY_LIMITS.actionPercent,
};

/** severity 'danger' is the action verdict (raises condition work); 'caution' is shown and watched only. */
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
  /** 'action' raises condition work; 'caution' is shown only. */
  verdict: 'within' | 'caution' | 'action';
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
