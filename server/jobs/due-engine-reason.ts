/**
 * The due evaluation explains itself with ids and UTC instants (shared/domain/due.ts); people read
 * meter names and their own shop's local time. This rewrites a reason for screens and mails.
 */
import { DateTime } from 'luxon';

const UUID = '[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}';
const ISO = /\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}\.\d{3}Z/g;

export type MeterLabel = { name: string; unit: string };

export function humanReason(reason: string, meterOf: (id: string) => MeterLabel | undefined, timeZone: string): string {
  return reason
    .replace(/ \(work already raised as [^)]*\)/g, ' (work already raised)')
    .replace(new RegExp(`meter oil:${UUID} reads 1 \\(limit: above 0\\.5\\)`, 'g'), 'an oil result outside its targets')
    .replace(new RegExp(`meter oil:${UUID} reads 0 \\(limit: above 0\\.5\\)(, trend reaches it [^,]+)?`, 'g'), 'oil results within targets')
    .replace(new RegExp(`meter oil:${UUID}: no reading( since last done)? \\(limit: above 0\\.5\\)`, 'g'), 'no oil result$1')
    .replace(new RegExp(`meter (${UUID})`, 'g'), (_, id: string) => meterOf(id)?.name ?? 'a meter')
    .replace(ISO, (iso) => DateTime.fromISO(iso, { zone: timeZone }).toFormat('d LLL yyyy HH:mm'));
}
