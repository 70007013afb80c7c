/**
 * Time-zone offsets without asking Intl every time. luxon's IANAZone works out each offset with
 * Intl.DateTimeFormat.formatToParts, which dominates any loop that converts many instants (the due
 * engine formats and shifts hundreds of thousands of them). `cachedZone` is the same zone with its
 * offsets remembered per hour: an hour whose start and end have the same offset holds no change of
 * offset, since no zone changes its offset twice within an hour. Hours containing a change are
 * never cached and fall through to Intl, so the answers are exactly IANAZone's.
 */
import '../luxon-clock';
import { IANAZone } from 'luxon';

const HOUR_MS = 3_600_000;
const MAX_HOURS_PER_ZONE = 200_000;
const MAX_ZONES = 256;

class CachedIANAZone extends IANAZone {
  private readonly hours = new Map<number, number>();

  override offset(ts: number): number {
    if (!Number.isFinite(ts)) return super.offset(ts);
    const hour = Math.floor(ts / HOUR_MS);
    const known = this.hours.get(hour);
    if (known !== undefined) return known;
    const start = super.offset(hour * HOUR_MS);
    const end = super.offset(hour * HOUR_MS + HOUR_MS - 1);
    if (start !== end || Number.isNaN(start)) return super.offset(ts);
    if (this.hours.size >= MAX_HOURS_PER_ZONE) this.hours.clear();
    this.hours.set(hour, start);
    return start;
  }
}

const zones = new Map<string, IANAZone>();

/**
 * The luxon zone for an IANA name, with cached offsets (a drop-in for `IANAZone.create(name)`:
 * same type, name and equality). Pass it as `{ zone }` to luxon's DateTime factories.
 */
export function cachedZone(name: string): IANAZone {
  let z = zones.get(name);
  if (z === undefined) {
    z = new CachedIANAZone(name);
    if (zones.size >= MAX_ZONES) zones.clear();
    zones.set(name, z);
  }
  return z;
}
