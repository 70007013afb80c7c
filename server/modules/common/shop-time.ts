import { DateTime } from 'luxon';

/** A moment as people in the shop read it: "2026-03-14 07:30 America/Chicago" (the shop's zone, not UTC). */
export function shopTime(at: Date, timeZone: string): string {
  return `${DateTime.fromJSDate(at, { zone: timeZone }).toFormat('yyyy-MM-dd HH:mm')} ${timeZone}`;
}
