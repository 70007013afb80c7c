/**
 * Tells the people who work a fed machine that it is locked out through a shared isolation point
 * on another machine, and again when that lock comes off: affected employees are told before the
 * devices go on and after they come off (OSHA 29 CFR 1910.147(c)(9)).
 */
import type { EntityManager } from '@mikro-orm/postgresql';
import type { Principal } from '../../http/principal';
import { queueMail } from '../../mail/outbox';
import { renderMail } from '../../mail/templates';
import { loadConfig } from '../../config';
import type { EnergySource } from '../../../shared/schemas/safety-procedures';

/** Who works a machine: anyone trained on its procedure (affected, minor servicing or authorized) or who did its pre-use check in the last 30 days. */
const RECENT_DAYS = 30;

type Recipient = { machine_id: string; code: string; name: string; email: string; person: string };

export type SharedPointLockout = { id: string; machineCode: string; machineName: string; reason: string };

export async function mailFedMachinePeople(
  tx: EntityManager,
  who: Principal,
  lockout: SharedPointLockout,
  sources: EnergySource[],
  lockedKeys: string[],
  event: 'applied' | 'released',
  now: Date,
): Promise<number> {
  const feeding = sources.filter((s) => lockedKeys.includes(s.key) && s.feeds?.length);
  const fedIds = [...new Set(feeding.flatMap((s) => s.feeds ?? []))];
  if (fedIds.length === 0) return 0;
  const rows = await tx.execute<Recipient[]>(
    `select distinct fm.id as machine_id, fm.code, fm.name, u.email, u.name as person
       from machine fm
       join (select t.person_id as user_id, p.machine_id from safety_training t join safety_procedure p on p.id = t.procedure_id where t.organization_id = ?
             union
             select c.person_id, c.machine_id from machine_pre_use_check c where c.organization_id = ? and c.checked_at > ?) w on w.machine_id = fm.id
       join app_user u on u.id = w.user_id
       join membership mb on mb.user_id = u.id and mb.organization_id = fm.organization_id and mb.active
      where fm.organization_id = ? and fm.id = any(?::uuid[]) and u.password_hash is not null and u.id <> ?
      order by u.email, fm.code`,
    [who.orgId, who.orgId, new Date(now.getTime() - RECENT_DAYS * 86_400_000), who.orgId, `{${fedIds.join(',')}}`, who.userId],
  );
  const byPerson = new Map<string, { name: string; machines: Recipient[] }>();
  for (const r of rows) {
    const entry = byPerson.get(r.email) ?? { name: r.person, machines: [] };
    entry.machines.push(r);
    byPerson.set(r.email, entry);
  }
  const appUrl = loadConfig().APP_URL;
  for (const [email, p] of byPerson) {
    const codes = p.machines.map((m) => m.code).join(', ');
    const points = (machineId: string) =>
      feeding
        .filter((s) => s.feeds?.includes(machineId))
        .map((s) => s.key)
        .join(', ');
    const lines = p.machines.map(
      (m) => `• ${m.code} ${m.name}: through ${points(m.machine_id)} on ${lockout.machineCode} ${lockout.machineName.toLowerCase()}`,
    );
    const applied = event === 'applied';
    queueMail(tx, {
      to: email,
      kind: applied ? 'shared-point-locked' : 'shared-point-released',
      organizationId: who.orgId,
      subject: (applied
        ? `${codes} locked out through ${lockout.machineCode}: ${lockout.reason}`
        : `${codes}: the shared point on ${lockout.machineCode} is unlocked`
      ).slice(0, 300),
      ...renderMail({
        heading: applied ? `${codes} locked out through a shared isolation point` : `Shared isolation point on ${lockout.machineCode} unlocked`,
        paragraphs: [
          `Hello ${p.name},`,
          applied
            ? `${who.name} locked out ${lockout.machineCode} ${lockout.machineName.toLowerCase()} (${lockout.reason}). Its isolation point also feeds the machine${p.machines.length === 1 ? '' : 's'} you work, so ${p.machines.length === 1 ? 'it is' : 'they are'} locked out too:`
            : `${who.name} released the lockout on ${lockout.machineCode} ${lockout.machineName.toLowerCase()} (${lockout.reason}). The shared isolation point is unlocked for:`,
          ...lines,
          applied
            ? 'Do not try to start these machines or restore their supply. Ask the person whose lock it is before anything is switched back on.'
            : 'Check each machine is ready and its own locks are off before you start it.',
        ],
        action: { label: 'Open the lockout', url: `${appUrl}/safety/lockouts/${lockout.id}` },
        caution: true,
      }),
    });
  }
  return byPerson.size;
}
