/**
 * Pre-use checks: the short list an operator answers at the start of a shift before running a
 * machine, per machine kind. The lines are common practice for sheet-metal shops (walk-round
 * checks before the first run); they are not copied from any standard. Press-brake guarding in
 * general is the subject of EN 12622 and risk reduction of ISO 12100, but the lines here are
 * from memory and shop practice, not quoted from those standards.
 *
 * A line is answered OK or Not OK; a reading line also takes a number, and a number outside its
 * limits fails the line whatever was tapped. Safety-critical lines are the ones whose failure
 * leaves a person unprotected (guards, light curtain, two-hand/foot control, torch collision
 * sensor, spark arrestor): a failed one means the machine must not run.
 *
 * The filter pressure-drop limit (1500 Pa across cartridge filters) is from memory: a usual
 * point to change or clean cartridges; a shop's own condition meter limits replace it.
 *
 * Pure module: no I/O, runs on the server and in the browser.
 */
import { DateTime } from 'luxon';
import type { MachineKind } from '../schemas/machines';

export type PreUseLine = {
  /** Stable code stored with every answer. */
  code: string;
  label: string;
  /** Failing it stops the machine. */
  safetyCritical: boolean;
  /** A reading line asks for a number in this unit besides OK / Not OK. */
  reading?: { unit: string; min: number | null; max: number | null; source: string };
};

/** Default pressure-drop limit across cartridge filters, Pa (from memory, see above). */
export const FILTER_PRESSURE_DROP_MAX_PA = 1500;

const PUNCH_LINES: PreUseLine[] = [
  { code: 'guards', label: 'Guards and fences closed, interlocks stop the machine', safetyCritical: true },
  { code: 'clamps', label: 'Sheet clamps grip and release', safetyCritical: false },
  { code: 'lubrication', label: 'Lubrication level and supply', safetyCritical: false },
];

/** Lines per machine kind; kinds not listed (components, hydraulic unit, other) have no pre-use check. */
export const PRE_USE_LINES: Partial<Record<MachineKind, PreUseLine[]>> = {
  'press-brake': [
    { code: 'light-curtain', label: 'Guard / light curtain: ram stops when the beam is broken', safetyCritical: true },
    { code: 'foot-pedal', label: 'Foot pedal: cover in place, stop and release work', safetyCritical: true },
    { code: 'die-clamps', label: 'Upper and lower die clamps tight', safetyCritical: false },
  ],
  // The cell punches like a turret punch and carries a plasma torch, so it adds the torch's sensor.
  'punch-plasma-cell': [...PUNCH_LINES, { code: 'collision-sensor', label: 'Torch collision sensor trips the torch', safetyCritical: true }],
  'plasma-table': [
    { code: 'collision-sensor', label: 'Torch collision sensor trips the torch', safetyCritical: true },
    { code: 'water-level', label: 'Water table level up to the mark', safetyCritical: false },
    { code: 'extraction-running', label: 'Fume extraction running', safetyCritical: false },
  ],
  'fume-extractor': [
    { code: 'spark-arrestor', label: 'Spark arrestor in place and clear', safetyCritical: true },
    {
      code: 'pressure-drop',
      label: 'Filter pressure drop',
      safetyCritical: false,
      reading: { unit: 'Pa', min: null, max: FILTER_PRESSURE_DROP_MAX_PA, source: 'Cartridge change point (from memory)' },
    },
  ],
};

/** The lines for a machine kind, with reading limits replaced by the machine's own meter limits where it has them. */
export function preUseLinesFor(
  kind: MachineKind,
  readingLimits?: Record<string, { min: number | null; max: number | null; source: string }>,
): PreUseLine[] | null {
  const lines = PRE_USE_LINES[kind];
  if (!lines) return null;
  return lines.map((l) => (l.reading && readingLimits?.[l.code] ? { ...l, reading: { ...l.reading, ...readingLimits[l.code] } } : l));
}

export type PreUseAnswer = { code: string; ok: boolean; value?: number | null };
export type PreUseVerdict = {
  code: string;
  label: string;
  safetyCritical: boolean;
  ok: boolean;
  value: number | null;
  /** Why the line failed, in a sentence; null when it passed. */
  problem: string | null;
};
export type PreUseResult = {
  lines: PreUseVerdict[];
  failed: PreUseVerdict[];
  safetyCriticalFailed: boolean;
  pass: boolean;
};

export class PreUseAnswerError extends Error {
  constructor(
    readonly field: string,
    message: string,
  ) {
    super(message);
  }
}

/**
 * Judges the answers against the lines: every line answered once, readings given where asked.
 * Throws PreUseAnswerError naming the field for a missing, doubled or unknown answer.
 */
export function evaluatePreUse(lines: PreUseLine[], answers: PreUseAnswer[]): PreUseResult {
  const byCode = new Map<string, PreUseAnswer>();
  answers.forEach((a, i) => {
    if (!lines.some((l) => l.code === a.code)) throw new PreUseAnswerError(`answers.${i}.code`, `“${a.code}” is not a line of this machine's check`);
    if (byCode.has(a.code)) throw new PreUseAnswerError(`answers.${i}.code`, `“${a.code}” is answered twice`);
    byCode.set(a.code, a);
  });
  const verdicts = lines.map((l): PreUseVerdict => {
    const a = byCode.get(l.code);
    if (!a) throw new PreUseAnswerError('answers', `Answer “${l.label}”`);
    const value = a.value ?? null;
    let problem = a.ok ? null : 'Not OK';
    if (l.reading) {
      if (value === null || !Number.isFinite(value))
        throw new PreUseAnswerError(`answers.${answers.indexOf(a)}.value`, `Enter the ${l.label.toLowerCase()} in ${l.reading.unit}`);
      if (l.reading.max !== null && value > l.reading.max) problem = `${value} ${l.reading.unit} is above the ${l.reading.max} ${l.reading.unit} limit`;
      else if (l.reading.min !== null && value < l.reading.min) problem = `${value} ${l.reading.unit} is below the ${l.reading.min} ${l.reading.unit} limit`;
    }
    return { code: l.code, label: l.label, safetyCritical: l.safetyCritical, ok: problem === null, value: l.reading ? value : null, problem };
  });
  const failed = verdicts.filter((v) => !v.ok);
  return { lines: verdicts, failed, safetyCriticalFailed: failed.some((f) => f.safetyCritical), pass: failed.length === 0 };
}

/** Start of the shop's day containing `now`, in the shop's time zone (midnight local, DST-aware). */
export function shopDayStart(now: Date, timeZone: string): Date {
  return DateTime.fromJSDate(now, { zone: timeZone }).startOf('day').toJSDate();
}

/**
 * Whether a machine missed its pre-use check: it needs one (has a list and is in service) and
 * nothing was signed since the start of the shop's day. Simple on purpose: one check per day
 * window, whatever the shift pattern.
 */
export function missedPreUseCheck(input: { needsCheck: boolean; lastCheckAt: Date | null; now: Date; timeZone: string }): boolean {
  if (!input.needsCheck) return false;
  const start = shopDayStart(input.now, input.timeZone);
  return !input.lastCheckAt || input.lastCheckAt < start;
}
