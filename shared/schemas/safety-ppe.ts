import { z } from 'zod';
import { signPassword } from './safety-sign-offs';
import { oneLine } from './text';

/** PPE items a requirement can list, each with the rule it comes from. */
export const PPE_ITEMS = [
  'safety-glasses',
  'filter-lens',
  'face-shield',
  'hearing-protection',
  'cut-resistant-gloves',
  'cutting-gauntlets',
  'safety-footwear',
  'flame-resistant-clothing',
  'respirator',
] as const;
export type PpeItem = (typeof PPE_ITEMS)[number];
export const PPE_ITEM_INFO: Record<PpeItem, { label: string; source: string }> = {
  'safety-glasses': { label: 'Safety glasses with side protection', source: 'OSHA 29 CFR 1910.133(a)(1)-(2)' },
  'filter-lens': { label: 'Filter lens (cutting goggles, shield or helmet)', source: 'OSHA 29 CFR 1910.133(a)(5)' },
  'face-shield': { label: 'Face shield over safety glasses', source: 'OSHA 29 CFR 1910.133(a)(1)' },
  'hearing-protection': { label: 'Hearing protection (plugs or muffs)', source: 'OSHA 29 CFR 1910.95(i)' },
  'cut-resistant-gloves': { label: 'Cut-resistant gloves for sheet handling', source: 'OSHA 29 CFR 1910.138(a)' },
  'cutting-gauntlets': { label: 'Heat-resistant cutting gauntlets', source: 'OSHA 29 CFR 1910.138(a)' },
  'safety-footwear': { label: 'Safety footwear with toe protection', source: 'OSHA 29 CFR 1910.136(a)' },
  'flame-resistant-clothing': { label: 'Flame-resistant clothing, sleeves down', source: 'ANSI Z49.1 §4.3 (common practice)' },
  respirator: { label: 'Respirator as fitted', source: 'OSHA 29 CFR 1910.134' },
};

export const CHECK_CADENCES = ['shift', 'week', 'none'] as const;
export type CheckCadence = (typeof CHECK_CADENCES)[number];
export const CADENCE_LABELS: Record<CheckCadence, string> = { shift: 'Every shift', week: 'Every week', none: 'No scheduled check' };

export const noiseExposureSchema = z.object({
  levelDbA: z.number({ message: 'Enter the level in dBA' }).min(40, 'Level below 40 dBA is not plausible').max(140, 'Level above 140 dBA is not plausible'),
  hours: z.number({ message: 'Enter the hours' }).min(0, 'Hours cannot be negative').max(24, 'At most 24 hours'),
});

export const ppeRequirementSchema = z
  .object({
    machineId: z.uuid({ message: 'Choose a machine' }),
    task: oneLine(z.string().trim().min(2, 'Name the task, e.g. “Plasma cutting”').max(120, 'Task: at most 120 characters')),
    items: z.array(z.enum(PPE_ITEMS)).max(PPE_ITEMS.length),
    otherItems: z
      .array(oneLine(z.string().trim().min(2).max(80)))
      .max(10)
      .default([]),
    /** Plasma arc current for the filter-lens shade (null when the task has no arc). */
    arcCurrentA: z.number({ message: 'Enter the arc current in amperes' }).positive('Arc current must be above 0 A').max(1000, 'At most 1000 A').nullable(),
    /** The day's noise at this task, for the dose (OSHA 29 CFR 1910.95 App. A). */
    noise: z.array(noiseExposureSchema).max(12).default([]),
    /** Highest peak sound pressure level at the task (impact noise from punching), dB; null when not measured. */
    peakDbC: z.number({ message: 'Enter the peak in dB' }).min(60, 'A peak below 60 dB is not plausible').max(170, 'At most 170 dB').nullable().default(null),
    /** Noise Reduction Rating of the protector issued for the task, dB (OSHA 29 CFR 1910.95 App. B); null when none is named. */
    protectorNrr: z.number({ message: 'Enter the NRR in dB' }).min(0, 'NRR cannot be negative').max(45, 'At most 45 dB').nullable().default(null),
    cadence: z.enum(CHECK_CADENCES).default('shift'),
  })
  .superRefine((v, ctx) => {
    const hours = v.noise.reduce((s, n) => s + n.hours, 0);
    if (hours > 24) ctx.addIssue({ code: 'custom', path: ['noise'], message: `Noise periods add up to ${hours} h; a day has 24` });
    if (v.items.length + v.otherItems.length === 0 && v.arcCurrentA === null && v.noise.length === 0) {
      ctx.addIssue({ code: 'custom', path: ['items'], message: 'List at least one PPE item' });
    }
  });
export type PpeRequirementInput = z.infer<typeof ppeRequirementSchema>;

export const ppeCheckSchema = z.object({
  requirementId: z.uuid({ message: 'Choose the task' }),
  /** Item codes the person tapped as "on"; other items as `other:<label>`. */
  confirmed: z.array(z.string().max(100)).max(40),
  password: signPassword,
});
export type PpeCheckInput = z.infer<typeof ppeCheckSchema>;

export type ShadeResult =
  | { ok: true; arcCurrentA: number; minimum: number; suggested: number; band: string; source: string; notes: string[]; siteOverride: boolean }
  | { ok: false; arcCurrentA: number; message: string; source: string };

/** One dose basis's verdict (shared/domain/noise.ts noiseVerdicts), rounded for display. */
export type NoiseBasisResult = { dosePercent: number; twaDbA: number | null; reached: boolean; limitDbA: number; label: string; source: string };

export type HearingResult = {
  /** Hearing-conservation basis (80–130 dBA), kept under its former names for stored sign-offs and clients. */
  dosePercent: number;
  twaDbA: number | null;
  band: string;
  description: string;
  required: boolean;
  requiredFromDbA: number;
  ruleSource: string;
  sources: string[];
  /** Action level on the 80–130 dBA dose, PEL on the 90–140 dBA dose (OSHA 29 CFR 1910.95 App. A). */
  actionLevel: NoiseBasisResult;
  pel: NoiseBasisResult;
  /** Peak over 140 dB (OSHA 29 CFR 1910.95(b)(2)); null when no peak was entered. */
  peak: { peakDbC: number; exceeded: boolean; limitDb: number; source: string } | null;
  /** Estimated exposure under the issued protector (OSHA 29 CFR 1910.95 App. B); null without an NRR or a PEL-basis TWA. */
  protected: { nrr: number; twaDbA: number; deratedTwaDbA: number; source: string; deratedSource: string } | null;
};

export type RequiredItem = { code: string; label: string; source: string; detail: string | null };

export type PpeRequirementRow = {
  id: string;
  machineId: string;
  machineCode: string;
  machineName: string;
  task: string;
  items: PpeItem[];
  otherItems: string[];
  arcCurrentA: number | null;
  noise: { levelDbA: number; hours: number }[];
  peakDbC: number | null;
  protectorNrr: number | null;
  cadence: CheckCadence;
  shade: ShadeResult | null;
  hearing: HearingResult | null;
  required: RequiredItem[];
  lastCheckAt: string | null;
  lastCheckByName: string | null;
};
