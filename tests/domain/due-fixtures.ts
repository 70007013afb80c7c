import type { PlanInput, Trigger } from '../../shared/domain/due';

/** Shared scenario of the due tests. Calendar facts: 2024-03-04 is a Monday; Europe/Berlin is CET (UTC+1) until 31 March 2024. */
export const D = (iso: string) => new Date(iso);

// Mondays 07:00 Europe/Berlin: 06:00Z in March (CET), 05:00Z from 1 April (CEST).
export const WEEKLY_MONDAY: Trigger = {
  kind: 'calendar-fixed',
  ical: 'DTSTART;TZID=Europe/Berlin:20240304T070000\nRRULE:FREQ=WEEKLY;BYDAY=MO',
};

/** A weekly plan done Mon 4 Mar, looked at on Fri 8 Mar 12:00Z, with a 2-day window; override what a test changes. */
export function plan(overrides: Partial<PlanInput>): PlanInput {
  return {
    now: D('2024-03-08T12:00:00Z'),
    startedAt: D('2024-03-01T00:00:00Z'),
    lastDoneAt: D('2024-03-04T10:00:00Z'),
    lastRaisedKey: null,
    triggers: [WEEKLY_MONDAY],
    meters: {},
    dueSoon: { days: 2 },
    ...overrides,
  };
}
