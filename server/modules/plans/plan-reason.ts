/**
 * The due evaluation explains itself with ids and UTC instants (shared/domain/due.ts); people read
 * meter names and their own shop's local time. This rewrites a reason for screens and mails.
 */
import { cachedZone } from '../../../shared/domain/zone-offsets';

const UUID = '[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}';
// Compiled once: the engine rewrites every reason of every plan it evaluates.
const RAISED = / \(work already raised as [^)]*\)/g;
const OIL_OUT = new RegExp(`meter oil:${UUID} reads 1 \\(limit: above 0\\.5\\)`, 'g');
const OIL_IN = new RegExp(`meter oil:${UUID} reads 0 \\(limit: above 0\\.5\\)(, trend reaches it [^,]+)?`, 'g');
const OIL_NONE = new RegExp(`meter oil:${UUID}: no reading( since last done)? \\(limit: above 0\\.5\\)`, 'g');
const METER = new RegExp(`meter (${UUID})`, 'g');
const ISO = /\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}\.\d{3}Z/g;
const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

export type MeterLabel = { name: string; unit: string };

const pad2 = (n: number) => (n < 10 ? `0${n}` : String(n));

/**
 * An instant as "d LLL yyyy HH:mm" (luxon's tokens, English month names) in the zone. Written out
 * because the engine formats hundreds of thousands of them and luxon's formatter costs more than
 * the evaluation; tests compare it with luxon's toFormat.
 */
export function shopTimeText(ms: number, timeZone: string): string {
  const offset = cachedZone(timeZone).offset(ms);
  if (!Number.isFinite(offset)) return 'Invalid DateTime';
  const local = new Date(ms + offset * 60_000);
  const year = local.getUTCFullYear();
  const yyyy = year >= 0 && year < 1000 ? String(year).padStart(4, '0') : String(year);
  return `${local.getUTCDate()} ${MONTHS[local.getUTCMonth()]} ${yyyy} ${pad2(local.getUTCHours())}:${pad2(local.getUTCMinutes())}`;
}

export function humanReason(reason: string, meterOf: (id: string) => MeterLabel | undefined, timeZone: string): string {
  let out = reason;
  if (out.includes(' (work already raised as ')) out = out.replace(RAISED, ' (work already raised)');
  if (out.includes('meter oil:')) {
    out = out.replace(OIL_OUT, 'an oil result outside its targets').replace(OIL_IN, 'oil results within targets').replace(OIL_NONE, 'no oil result$1');
  }
  if (out.includes('meter ')) out = out.replace(METER, (_, id: string) => meterOf(id)?.name ?? 'a meter');
  return out.replace(ISO, (iso) => shopTimeText(Date.parse(iso), timeZone));
}
