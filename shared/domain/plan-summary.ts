/**
 * Short plain-language descriptions of plan triggers for lists, mails and the calendar feed.
 * Calendar rules are described with rrule's own RFC 5545 text rendering (RRule#toText).
 * Pure: no I/O.
 */
import { RRule } from './rrule';
import type { StoredTrigger } from '../schemas/plans';
import { formatNumber, shopLocale } from '../locale';

export type MeterLabel = { name: string; unit: string };

function ruleText(rrule: string): string {
  try {
    return RRule.fromString(rrule).toText();
  } catch {
    return rrule;
  }
}

// In the shop's locale, as every number the product shows (shared/locale.ts).
const num = (n: number) => formatNumber(n, shopLocale(), { max: 3 });

/** "every week on Monday at 07:00", "every 500 h of Pump hours", "Filter ΔP above 1500 Pa" … */
export function summarizeTrigger(t: StoredTrigger, meter?: MeterLabel): string {
  switch (t.kind) {
    case 'calendar-fixed': {
      const time = t.start.slice(11, 16);
      return `${ruleText(t.rrule)} at ${time} (from ${t.start.slice(0, 10)})`;
    }
    case 'calendar-floating':
      return `${t.every} ${t.unit}${t.every === 1 ? '' : 's'} after it was last done`;
    case 'meter':
      return `every ${num(t.every)} ${meter?.unit ?? 'units'} of ${meter?.name ?? 'a meter'}`;
    case 'condition': {
      const parts = [t.above !== undefined ? `above ${num(t.above)}` : null, t.below !== undefined ? `below ${num(t.below)}` : null].filter(Boolean);
      return `${meter?.name ?? 'a reading'} ${parts.join(' or ')} ${meter?.unit ?? ''}`.trim();
    }
    case 'oil-analysis':
      return 'an oil result outside the unit’s targets';
  }
}

/** Several triggers read "whichever comes first". */
export function summarizeTriggers(ts: StoredTrigger[], meterOf: (id: string) => MeterLabel | undefined): string {
  const parts = ts.map((t) => summarizeTrigger(t, 'meterId' in t ? meterOf(t.meterId) : undefined));
  return parts.length > 1 ? `${parts.join(', or ')} — whichever comes first` : (parts[0] ?? '');
}

/**
 * The share of a meter interval used so far, 0…1: how far the meter has come since the interval
 * started (the reading at the last completion) out of the interval's length, (current − start) ÷
 * (due − start), clamped. Linear interpolation along a usage-based interval, as "every N units since
 * it was last done" counts it (common practice; plain arithmetic). Not the reading over the mark:
 * a meter at 12 000 h with the next mark at 12 500 h has used 0 of a 500 h interval, not 96 %.
 */
export function intervalUsed(current: number | null, startValue: number, dueValue: number): number {
  if (current === null || !Number.isFinite(current)) return 0;
  const length = dueValue - startValue;
  if (!(length > 0)) return current >= dueValue ? 1 : 0;
  return Math.min(1, Math.max(0, (current - startValue) / length));
}
