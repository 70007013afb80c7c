/**
 * Wall clock <-> instant in an IANA zone (RFC 5545 §3.3.5 rules for gaps and overlaps), and
 * canonical zone ids. Converters are cached per zone so offset caches are shared by every rule.
 */
import '../../luxon-clock';
import { IANAZone } from 'luxon';
import { cachedZone } from '../zone-offsets';
import { DAY_MS, MINUTE_MS, fail, wallToMs, type WallClock } from './types';

/**
 * Canonical IANA time-zone id (RFC 5545 §3.2.19 TZID values are IANA ids here), e.g.
 * 'europe/berlin' → 'Europe/Berlin'; throws an Error naming an unknown id.
 */
// Intl zone checks cost tens of microseconds each; ids are few, so remember the good ones.
const canonicalZoneCache = new Map<string, string>();

export function canonicalZone(tzid: string): string {
  const hit = typeof tzid === 'string' ? canonicalZoneCache.get(tzid) : undefined;
  if (hit !== undefined) return hit;
  const id = canonicalZoneUncached(tzid);
  if (canonicalZoneCache.size >= 256) canonicalZoneCache.clear();
  canonicalZoneCache.set(tzid, id);
  return id;
}

function canonicalZoneUncached(tzid: string): string {
  const trimmed = tzid.trim();
  if (!trimmed || !IANAZone.isValidZone(trimmed)) {
    fail(`unknown time zone "${tzid}" (expected an IANA id such as Europe/Berlin)`);
  }
  try {
    return new Intl.DateTimeFormat('en-US', { timeZone: trimmed }).resolvedOptions().timeZone;
  } catch {
    return trimmed;
  }
}

export interface ZoneConv {
  /** Offset in minutes at an instant. */
  offsetAt(instantMs: number): number;
  fixed: boolean;
}

// One converter per zone, so its offset cache is shared by every rule in that zone.
const zoneCache = new Map<string, ZoneConv>();

export function makeZone(tzid: string): ZoneConv {
  let z = zoneCache.get(tzid);
  if (z === undefined) {
    z = makeZoneUncached(tzid);
    if (zoneCache.size >= 256) zoneCache.clear();
    zoneCache.set(tzid, z);
  }
  return z;
}

function makeZoneUncached(tzid: string): ZoneConv {
  if (tzid === 'UTC' || tzid === 'Etc/UTC') return { offsetAt: () => 0, fixed: true };
  const zone = cachedZone(tzid);
  return { fixed: false, offsetAt: (ms: number) => zone.offset(ms) };
}

/**
 * Instant for a wall-clock time in a zone, per RFC 5545 §3.3.5: an ambiguous time
 * (fall-back) is the first occurrence; a non-existent time (spring-forward gap) is read
 * with the offset before the gap, i.e. shifted forward by the gap. Returns `gap: true`
 * for the latter so callers can reject or skip instead.
 */
export function wallToInstant(wallMs: number, zone: ZoneConv): { ms: number; gap: boolean } {
  if (zone.fixed) return { ms: wallMs - zone.offsetAt(wallMs) * MINUTE_MS, gap: false };
  // Probe points on UTC day boundaries, so consecutive daily occurrences share them (cache hits).
  const dayStart = Math.floor(wallMs / DAY_MS) * DAY_MS;
  const before = zone.offsetAt(dayStart - DAY_MS);
  const after = zone.offsetAt(dayStart + 2 * DAY_MS);
  if (before === after) {
    const ms = wallMs - before * MINUTE_MS;
    if (zone.offsetAt(ms) === before) return { ms, gap: false };
  }
  const candidates = new Set([before, after, zone.offsetAt(wallMs)]);
  let best: number | null = null;
  for (const o of candidates) {
    const ms = wallMs - o * MINUTE_MS;
    if (zone.offsetAt(ms) === o && (best === null || ms < best)) best = ms;
  }
  if (best !== null) return { ms: best, gap: false };
  return { ms: wallMs - before * MINUTE_MS, gap: true };
}

export function instantToWall(instantMs: number, zone: ZoneConv): number {
  return instantMs + zone.offsetAt(instantMs) * MINUTE_MS;
}

/** Converts a wall-clock time in an IANA zone to an instant (RFC 5545 §3.3.5 rules); reports gaps. */
export function localToInstant(local: WallClock, tzid: string): { instant: Date; nonexistent: boolean } {
  const zone = makeZone(canonicalZone(tzid));
  const r = wallToInstant(wallToMs(local), zone);
  return { instant: new Date(r.ms), nonexistent: r.gap };
}
