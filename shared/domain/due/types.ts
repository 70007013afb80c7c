/** Inputs, results and limits of the due engine (rules in ./index.ts). */
export const DAY_MS = 86_400_000;
/** Minimum grace after a due point (see module comment). */
export const MIN_GRACE_MS = DAY_MS;
/** How many fixed-calendar occurrences after the last completion are checked for early completion. */
export const COVER_SCAN = 64;

export type Trigger =
  | { kind: 'calendar-fixed'; ical: string }
  | { kind: 'calendar-floating'; every: number; unit: 'day' | 'week' | 'month'; tz: string }
  | { kind: 'meter'; meterId: string; every: number }
  | { kind: 'condition'; meterId: string; above?: number; below?: number };

export interface Reading {
  at: Date;
  value: number;
}

export interface MeterInput {
  /** Meter value at the last completion (or when the plan started). */
  baseline: number;
  latest: Reading | null;
  /** Recent readings for the usage trend; may include `latest`. */
  recent: Reading[];
}

export interface DueSoonWindow {
  days?: number;
  fraction?: number;
}

export interface PlanInput {
  now: Date;
  startedAt: Date;
  lastDoneAt: Date | null;
  lastRaisedKey: string | null;
  triggers: Trigger[];
  meters: Record<string, MeterInput>;
  dueSoon: DueSoonWindow;
}

export type DueStatus = 'not-due' | 'due-soon' | 'due' | 'overdue';

export interface TriggerEvaluation {
  index: number;
  kind: Trigger['kind'];
  status: DueStatus;
  /** Calendar due point, meter crossing/forecast time, or condition crossing/forecast time. */
  dueAt: Date | null;
  /** Key of this trigger's occurrence when it is due or overdue, else null. */
  key: string | null;
  reason: string;
  /** Earliest instant at which this trigger's status can change by the passing of time alone, or null. */
  changesAt: Date | null;
}

export interface MeterDue {
  meterId: string;
  /** The reading the current interval counts from (the baseline at the last completion). */
  startValue: number;
  dueValue: number;
  current: number | null;
  /** When the meter reached dueValue (estimated between readings) or is forecast to. */
  forecastAt: Date | null;
}

export interface Evaluation {
  status: DueStatus;
  /** Earliest due point over all triggers (calendar date, meter crossing or forecast). */
  dueAt: Date | null;
  dueMeter: MeterDue[];
  /** Human-readable: which trigger decided and why. */
  reason: string;
  /** Key of the occurrence due now (status 'due' or 'overdue'), else null. */
  occurrenceKey: string | null;
  /** occurrenceKey equals lastRaisedKey: the server has it already. */
  alreadyRaised: boolean;
  /** Index into `triggers` of the deciding trigger. */
  decidedBy: number;
  triggers: TriggerEvaluation[];
  /** Earliest `changesAt` over the triggers: re-evaluate no later than this (null: only new input changes it). */
  changesAt: Date | null;
}
