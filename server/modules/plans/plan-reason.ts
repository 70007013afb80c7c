/**
 * The due evaluation explains itself with ids and UTC instants (shared/domain/due.ts); people read
 * meter names and their own shop's local time (shared/locale.ts). This rewrites a reason for screens and mails.
 */
import { formatDateTime, type ShopClock } from '../../../shared/locale';

const UUID = '[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}';
// Compiled once: the engine rewrites every reason of every plan it evaluates.
const RAISED = / \(work already raised as [^)]*\)/g;
const OIL_OUT = new RegExp(`meter oil:${UUID} reads 1 \\(limit: above 0\\.5\\)`, 'g');
const OIL_IN = new RegExp(`meter oil:${UUID} reads 0 \\(limit: above 0\\.5\\)(, trend reaches it [^,]+)?`, 'g');
const OIL_NONE = new RegExp(`meter oil:${UUID}: no reading( since last done)? \\(limit: above 0\\.5\\)`, 'g');
const METER = new RegExp(`meter (${UUID})`, 'g');
const ISO = /\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}\.\d{3}Z/g;

export type MeterLabel = { name: string; unit: string };

export function humanReason(reason: string, meterOf: (id: string) => MeterLabel | undefined, shop: ShopClock): string {
  let out = reason;
  if (out.includes(' (work already raised as ')) out = out.replace(RAISED, ' (work already raised)');
  if (out.includes('meter oil:')) {
    out = out.replace(OIL_OUT, 'an oil result outside its targets').replace(OIL_IN, 'oil results within targets').replace(OIL_NONE, 'no oil result$1');
  }
  if (out.includes('meter ')) out = out.replace(METER, (_, id: string) => meterOf(id)?.name ?? 'a meter');
  return out.replace(ISO, (iso) => formatDateTime(iso, shop));
}
