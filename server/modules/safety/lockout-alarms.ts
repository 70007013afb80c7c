/**
 * The alarm for a machine that ran while locked out: after counter readings are written (typed in
 * or imported), each meter on a machine with a verified lockout is checked with
 * meterAdvancesDuringLockouts. Each piece of evidence raises one alarm, at once and in the same
 * transaction as the readings: an entry in the safety audit, a mail to the safety officers and the
 * lock holders, and a mark on the station page (read from the same entries).
 */
import type { EntityManager } from '@mikro-orm/postgresql';
import { meterAdvancesDuringLockouts } from '../../../shared/domain/lockout-conflicts';
import { readingValue } from '../../../shared/domain/meters';
import { shopLocale } from '../../../shared/locale';
import { raiseAlarm } from './safety-events';
import { splitAroundTestWindows } from './testing-window.queries';
import { queueMail } from '../../mail/outbox';
import { renderMail } from '../../mail/templates';
import { loadConfig } from '../../config';
import { clock } from '../../../shared/clock';

export const RAN_WHILE_LOCKED = 'Machine ran while locked out — or an energy source is missing from the procedure';

type LockoutSql = { id: string; verified_at: Date; released_at: Date | null; primary_id: string };

/** Returns how many new alarms were raised. */
export async function checkCounterAdvances(tx: EntityManager, orgId: string, meterIds: string[] | 'all-locked'): Promise<number> {
  if (meterIds === 'all-locked') {
    // An import may touch any meter: check those on machines that have been locked out and verified.
    const rows = await tx.execute<{ id: string }[]>(
      `select mt.id from meter mt join machine m on m.id = mt.machine_id where mt.organization_id = ?
          and exists (select 1 from safety_lockout l where l.verified_at is not null and l.organization_id = mt.organization_id
                        and (l.machine_id = m.id or l.machine_id = m.parent_id or l.machine_id in (select p.parent_id from machine p where p.id = m.parent_id)))`,
      [orgId],
    );
    meterIds = rows.map((r) => r.id);
  }
  if (meterIds.length === 0) return 0;
  const locale = shopLocale();
  const meters = await tx.execute<{ id: string; name: string; unit: string; machine_id: string; code: string; machine_code: string; machine_name: string }[]>(
    `select mt.id, mt.name, mt.unit, mt.machine_id, mt.code, m.code as machine_code, m.name as machine_name
       from meter mt join machine m on m.id = mt.machine_id
      where mt.organization_id = ? and mt.id = any(?::uuid[]) and mt.kind <> 'condition'`,
    [orgId, `{${[...new Set(meterIds)].join(',')}}`],
  );
  const now = clock.now();
  let raised = 0;
  for (const meter of meters) {
    // A lockout on the cell locks its components too: take lockouts on the meter's machine and every machine above it.
    const lockouts = await tx.execute<LockoutSql[]>(
      `with recursive up(id, parent_id) as (
         select id, parent_id from machine where id = ? union all select m.id, m.parent_id from machine m join up on m.id = up.parent_id)
       select id, verified_at, released_at, primary_id from safety_lockout
        where organization_id = ? and machine_id in (select id from up) and verified_at is not null`,
      [meter.machine_id, orgId],
    );
    if (lockouts.length === 0) continue;
    // Split around test or positioning windows: the machine runs on purpose while the devices are off.
    const windows = await splitAroundTestWindows(
      tx,
      orgId,
      lockouts.map((l) => ({
        id: l.id,
        verifiedAt: new Date(l.verified_at),
        releasedAt: l.released_at ? new Date(l.released_at) : null,
        primaryId: l.primary_id,
      })),
    );
    const readings = await tx.execute<{ read_at: Date; value: number }[]>(
      `select r.read_at, r.value from meter_reading r
        where r.organization_id = ? and r.meter_id = ?
          and exists (select 1 from safety_lockout l where l.id = any(?::uuid[])
                       and r.read_at >= l.verified_at and r.read_at <= coalesce(l.released_at, ?))
        order by r.read_at`,
      [orgId, meter.id, `{${lockouts.map((l) => l.id).join(',')}}`, now],
    );
    const advances = meterAdvancesDuringLockouts(
      windows,
      readings.map((r) => ({ at: new Date(r.read_at), value: Number(r.value) })),
      now,
    );
    for (const a of advances) {
      const lockout = windows.find((w) => w.verifiedAt <= a.from.at && a.to.at <= (w.releasedAt ?? now))!;
      const reason = `${RAN_WHILE_LOCKED}: ${meter.machine_code} ${meter.name} rose by ${readingValue(a.advance, locale)} ${meter.unit} (${readingValue(a.from.value, locale)} → ${readingValue(a.to.value, locale)}) while locked out and verified`;
      const isNew = await raiseAlarm(tx, orgId, {
        action: 'meter.advance-while-locked',
        reason,
        machineId: meter.machine_id,
        subjectId: lockout.id,
        details: {
          meterId: meter.id,
          meterCode: meter.code,
          unit: meter.unit,
          from: { at: a.from.at.toISOString(), value: a.from.value },
          to: { at: a.to.at.toISOString(), value: a.to.value },
          advance: a.advance,
          lockoutId: lockout.id,
        },
        dedupeKey: `advance:${meter.id}:${a.from.at.toISOString()}:${a.to.at.toISOString()}`,
      });
      if (!isNew) continue;
      raised++;
      await mailAlarm(tx, orgId, lockout.id, meter, reason);
    }
  }
  return raised;
}

async function mailAlarm(tx: EntityManager, orgId: string, lockoutId: string, meter: { machine_code: string; machine_name: string }, reason: string) {
  // The safety officers, the lockout's holder and everyone with a lock on it now.
  const people = await tx.execute<{ email: string; name: string }[]>(
    `select distinct u.email, u.name from app_user u
      where u.id in (
        select m.user_id from membership m where m.organization_id = ? and m.active and m.role = 'safety'
        union select l.primary_id from safety_lockout l where l.id = ?
        union select p.holder_id from safety_lockout_point p where p.session_id = ? and p.removed_at is null
        union select lm.user_id from safety_lockout_member lm where lm.session_id = ? and lm.left_at is null)
      order by u.email`,
    [orgId, lockoutId, lockoutId, lockoutId],
  );
  const appUrl = loadConfig().APP_URL;
  for (const p of people) {
    queueMail(tx, {
      to: p.email,
      kind: 'lockout-alarm',
      organizationId: orgId,
      subject: `ALARM ${meter.machine_code}: counter rose while locked out`,
      ...renderMail({
        heading: `${meter.machine_code} ${meter.machine_name}: counter rose while locked out`,
        paragraphs: [
          `Hello ${p.name},`,
          reason + '.',
          'Stop all work on the machine. Check every lock and tag is in place, find out how the machine ran, and check the procedure names every energy source that feeds it (OSHA 29 CFR 1910.147(c)(4)(ii), (d)(6)).',
        ],
        action: { label: 'Open the lockout', url: `${appUrl}/safety/lockouts/${lockoutId}` },
        caution: true,
      }),
    });
  }
}
