import { z } from 'zod';
import { signPassword } from './safety-sign-offs';
import { oneLine } from './text';

/** Kinds of hazardous energy a procedure names (OSHA 29 CFR 1910.147(b) "energy source"). */
export const ENERGY_KINDS = ['electrical', 'hydraulic', 'pneumatic', 'plasma-power', 'gravity', 'stored-mechanical', 'thermal', 'chemical', 'other'] as const;
export type EnergyKind = (typeof ENERGY_KINDS)[number];
export const ENERGY_KIND_LABELS: Record<EnergyKind, string> = {
  electrical: 'Electrical supply',
  hydraulic: 'Hydraulic pressure / accumulator',
  pneumatic: 'Pneumatic supply',
  'plasma-power': 'Plasma power source',
  gravity: 'Gravity (raised parts)',
  'stored-mechanical': 'Stored mechanical (springs, flywheels)',
  thermal: 'Thermal (hot surfaces, coolant)',
  chemical: 'Chemical / gas',
  other: 'Other',
};

/**
 * The phases of applying energy control, in the order OSHA 29 CFR 1910.147(d)(1)-(6) sets
 * them out. Steps are stored per phase, so they can never be written out of order.
 */
export const PROCEDURE_PHASES = ['prepare', 'shutdown', 'isolate', 'apply', 'relieve', 'verify'] as const;
export type ProcedurePhase = (typeof PROCEDURE_PHASES)[number];
export const PHASE_LABELS: Record<ProcedurePhase, { title: string; source: string }> = {
  prepare: { title: 'Prepare for shutdown', source: '1910.147(d)(1)' },
  shutdown: { title: 'Shut the machine down', source: '1910.147(d)(2)' },
  isolate: { title: 'Isolate every energy source', source: '1910.147(d)(3)' },
  apply: { title: 'Apply locks and tags', source: '1910.147(d)(4)' },
  relieve: { title: 'Relieve stored energy', source: '1910.147(d)(5)' },
  verify: { title: 'Verify isolation', source: '1910.147(d)(6)' },
};

const text = (what: string, max: number) =>
  z
    .string({ message: `${what} is required` })
    .trim()
    .min(1, `${what} is required`)
    .max(max, `${what}: at most ${max} characters`);

const POINT_TAG = /^[A-Z][A-Z0-9-]{0,7}$/;

/**
 * Isolation-point tag "<machine code>-E<n>" (C2-E1, C2-E2 …): a bare "H1" or "P1" reads as a machine
 * code. Tags are stored in 8 characters, so a machine code too long for that falls back to "E<n>".
 * Procedures written before this keep their short tags (E1, H1) and still read and lock out.
 */
export function pointTag(machineCode: string, n: number): string {
  const tag = `${machineCode.trim().toUpperCase()}-E${n}`;
  return POINT_TAG.test(tag) ? tag : `E${n}`;
}

/** The first tag in the scheme not already used on this procedure. */
export function nextPointTag(machineCode: string, used: string[]): string {
  for (let n = 1; ; n++) if (!used.includes(pointTag(machineCode, n))) return pointTag(machineCode, n);
}

export const energySourceSchema = z.object({
  /** Tag painted at the isolation point and printed on the placard, e.g. "C2-E1" (see pointTag). */
  key: z.string().trim().regex(POINT_TAG, 'Use a tag such as C2-E1: machine code, E and a number (capital letters, digits, dash; at most 8)'),
  kind: z.enum(ENERGY_KINDS, { message: 'Choose the kind of energy' }),
  description: text('Description', 200),
  magnitude: text('Magnitude', 80),
  isolationDevice: text('Isolation device', 120),
  location: text('Location', 120),
  relieveMethod: text('How stored energy is relieved', 400),
  verifyMethod: text('How isolation is verified', 400),
  /**
   * Other machines this isolation point also supplies (a hydraulic unit feeding two cells): locking
   * it marks them locked out too, and their own procedures must name this point (1910.147(c)(4)(ii)(B)).
   */
  feeds: z
    .array(z.uuid({ message: 'Choose a machine' }), { message: 'Choose the machines this point also feeds' })
    .max(20, 'At most 20 machines')
    .optional(),
});
export type EnergySource = z.infer<typeof energySourceSchema>;

const MINOR_KEY = /^[a-z][a-z0-9-]{1,39}$/;
export const minorTaskSchema = z.object({
  key: z.string().trim().regex(MINOR_KEY, 'Use a short key: lowercase letters, digits and dashes, e.g. torch-consumables'),
  name: text('Task name', 120),
  alternativeMeasures: z.array(text('Measure', 300)).min(1, 'Name at least one alternative measure').max(10),
});
export type MinorTask = z.infer<typeof minorTaskSchema>;

const stepList = (phase: ProcedurePhase) =>
  z
    .array(text('Step', 400), { message: `${PHASE_LABELS[phase].title}: add at least one step` })
    .min(1, `${PHASE_LABELS[phase].title}: add at least one step`)
    .max(30, 'At most 30 steps per phase');

const contentObject = z.object({
  title: oneLine(text('Title', 160)),
  scope: text('Scope', 1000),
  sources: z.array(energySourceSchema).min(1, 'Name at least one energy source').max(20, 'At most 20 energy sources'),
  steps: z.object({
    prepare: stepList('prepare'),
    shutdown: stepList('shutdown'),
    isolate: stepList('isolate'),
    apply: stepList('apply'),
    relieve: stepList('relieve'),
    verify: stepList('verify'),
  }),
  /** Release from lockout, OSHA 29 CFR 1910.147(e)(1)-(3). */
  release: z.array(text('Release step', 400)).min(1, 'Add at least one release step').max(30),
  /**
   * Minor servicing done during normal production without a full lockout, because the task is
   * routine, repetitive and integral and the alternative measures give effective protection
   * (OSHA 29 CFR 1910.147(a)(2)(ii), note). Each names its own measures; a person trained on the
   * task may do it under these measures instead of the lockout.
   */
  minorTasks: z.array(minorTaskSchema).max(10).optional(),
});

function uniqueKeys(v: { sources: { key: string; feeds?: string[] }[]; minorTasks?: { key: string }[] }, ctx: z.RefinementCtx) {
  const tasks = new Set<string>();
  (v.minorTasks ?? []).forEach((t, i) => {
    if (tasks.has(t.key)) ctx.addIssue({ code: 'custom', path: ['minorTasks', i, 'key'], message: `Task ${t.key} is named twice` });
    tasks.add(t.key);
  });
  const seen = new Set<string>();
  v.sources.forEach((s, i) => {
    if (seen.has(s.key)) ctx.addIssue({ code: 'custom', path: ['sources', i, 'key'], message: `Tag ${s.key} is used twice` });
    seen.add(s.key);
    const fed = new Set<string>();
    (s.feeds ?? []).forEach((id, j) => {
      if (fed.has(id)) ctx.addIssue({ code: 'custom', path: ['sources', i, 'feeds', j], message: 'This machine is named twice' });
      fed.add(id);
    });
  });
}

export const procedureContentSchema = contentObject.superRefine(uniqueKeys);
export type ProcedureContent = z.infer<typeof procedureContentSchema>;

export const createProcedureSchema = contentObject.extend({ machineId: z.uuid({ message: 'Choose a machine' }) }).superRefine(uniqueKeys);
export type CreateProcedureInput = z.infer<typeof createProcedureSchema>;

export const approveVersionSchema = z.object({
  password: signPassword,
  /** An editorial change (typo, photo) need not send everyone back to training. */
  retrainingRequired: z.boolean().default(true),
});
export type ApproveVersionInput = z.infer<typeof approveVersionSchema>;

export const versionParams = z.object({ id: z.uuid({ message: 'Not a valid id' }), version: z.coerce.number().int().min(1) });

export const photoParams = z.object({ id: z.uuid({ message: 'Not a valid id' }), photoId: z.uuid({ message: 'Not a valid id' }) });
export const photoUploadFields = z.object({
  sourceKey: z
    .string()
    .trim()
    .regex(/^[A-Z][A-Z0-9-]{0,7}$/, 'Choose the isolation point this photo shows'),
  caption: z.string().trim().max(200, 'Caption: at most 200 characters').optional(),
});

export type VersionStatus = 'draft' | 'approved' | 'superseded';

export type ProcedureSummary = {
  id: string;
  machineId: string;
  machineCode: string;
  machineName: string;
  title: string;
  currentVersion: number | null;
  currentApprovedAt: string | null;
  draftVersion: number | null;
  lastInspectionAt: string | null;
  inspectionDueAt: string | null;
};

export type PhotoRow = { id: string; sourceKey: string; caption: string | null; mime: string; size: number };

export type VersionDetail = {
  id: string;
  version: number;
  status: VersionStatus;
  content: ProcedureContent;
  authorName: string;
  createdAt: string;
  approvedAt: string | null;
  approvedByName: string | null;
  approvalSignOffId: string | null;
  retrainingRequired: boolean;
  photos: PhotoRow[];
};

/** An isolation point on another machine's approved procedure that also feeds this machine. */
export type FeedingPoint = Omit<EnergySource, 'feeds'> & { fromMachine: { id: string; code: string; name: string } };

/** Why a fed machine's procedure cannot be approved yet: the server's refusal and the editor say the same. */
export const missingPointText = (p: FeedingPoint, fedCode: string) =>
  `${p.key} (${p.fromMachine.name.toLowerCase()} ${p.fromMachine.code}) feeds ${fedCode}; add it to this procedure's energy sources before approving`;

export type ProcedureDetail = {
  id: string;
  machine: { id: string; code: string; name: string; kind: string };
  /** Codes of the machines the versions' sources feed, by id, for "also feeds C1, C2". */
  fedMachines: Record<string, { code: string; name: string }>;
  /** Points on other machines that feed this one: its procedure must name each (same tag). */
  feedingPoints: FeedingPoint[];
  versions: { id: string; version: number; status: VersionStatus; approvedAt: string | null; approvedByName: string | null }[];
  current: VersionDetail | null;
  draft: VersionDetail | null;
};
