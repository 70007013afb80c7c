import { DateTime, Info } from 'luxon';

// Wall-clock conversions that need a zone's offset at a given local time (datetime-local fields,
// the server), apart from ./locale so that pages that only show times do not load luxon.

/** Whether `zone` names a time zone this runtime knows ("Europe/Berlin" yes, "Mars/Olympus" no). */
export const isTimeZone = (zone: string): boolean => Info.isValidIANAZone(zone);

/** An instant as "YYYY-MM-DDTHH:mm" in the shop's zone, for a datetime-local field. */
export function toShopLocal(iso: string | null, timeZone: string): string {
  return iso ? DateTime.fromISO(iso).setZone(timeZone).toFormat("yyyy-MM-dd'T'HH:mm") : '';
}

/** A datetime-local value read in the shop's zone (not the browser's) as an ISO instant, or null. */
export function fromShopLocal(local: string, timeZone: string): string | null {
  return local ? DateTime.fromISO(local, { zone: timeZone }).toUTC().toISO() : null;
}
