import { DateTime } from 'luxon';

// Wall-clock conversions for datetime-local fields, apart from ./format so that pages without
// such a field (the station) do not load luxon.

/** An instant as "YYYY-MM-DDTHH:mm" in the shop's zone, for a datetime-local field. */
export function toShopLocal(iso: string | null, timeZone: string): string {
  return iso ? DateTime.fromISO(iso).setZone(timeZone).toFormat("yyyy-MM-dd'T'HH:mm") : '';
}

/** A datetime-local value read in the shop's zone (not the browser's) as an ISO instant, or null. */
export function fromShopLocal(local: string, timeZone: string): string | null {
  return local ? DateTime.fromISO(local, { zone: timeZone }).toUTC().toISO() : null;
}
