/**
 * The lock register: every personal and group lock by number, who holds it, where it is applied
 * now and where it has been (OSHA 29 CFR 1910.147(c)(5)(ii)(C)(1): devices identify the employee
 * who applied them, so the shop can answer "whose lock is this?" for any number).
 */
import type { EntityManager } from '@mikro-orm/postgresql';
import type { Principal } from '../../http/principal';
import type { Page } from '../../../shared/schemas/paging';
import type { LockRegisterQuery, LockRegisterRow, LockUse } from '../../../shared/schemas/safety-lockout';

type UseSql = {
  lock: string;
  lockout_id: string;
  machine_code: string;
  where: string;
  personal: boolean;
  holder_name: string;
  applied_at: Date;
  removed_at: Date | null;
  removed_by_name: string | null;
};

const usesSql = `
  select upper(p.lock_number) as lock, s.id as lockout_id, m.code as machine_code, p.source_key as "where", false as personal,
         h.name as holder_name, p.applied_at, p.removed_at, rb.name as removed_by_name
    from safety_lockout_point p join safety_lockout s on s.id = p.session_id join machine m on m.id = s.machine_id
    join app_user h on h.id = p.holder_id left join app_user rb on rb.id = p.removed_by_id
   where p.organization_id = ? and p.device not in ('tag-only', 'blocking')
  union all
  select upper(lm.lock_number), s.id, m.code, 'personal lock', true, u.name, lm.joined_at, lm.left_at, case when lm.left_at is null then null else u.name end
    from safety_lockout_member lm join safety_lockout s on s.id = lm.session_id join machine m on m.id = s.machine_id join app_user u on u.id = lm.user_id
   where lm.organization_id = ?
  union all
  select upper(l.n), s.id, m.code, o.company || ' lock', true, o.lead_name || ' (' || o.company || ')', o.locks_applied_at, o.locks_removed_at,
         case when o.locks_removed_at is null then null else o.lead_name || ' (' || o.company || ')' end
    from safety_outside_party o cross join lateral jsonb_array_elements_text(o.lock_numbers) as l(n)
    join safety_lockout s on s.id = o.session_id join machine m on m.id = s.machine_id
   where o.organization_id = ? and o.locks_applied_at is not null`;

export async function lockRegister(em: EntityManager, who: Principal, q: LockRegisterQuery): Promise<Page<LockRegisterRow>> {
  const uses = await em.getConnection().execute<UseSql[]>(`${usesSql} order by 7 desc`, [who.orgId, who.orgId, who.orgId]);
  const byLock = new Map<string, LockUse[]>();
  for (const u of uses) {
    const list = byLock.get(u.lock) ?? [];
    list.push({
      lockoutId: u.lockout_id,
      machineCode: u.machine_code,
      where: u.where,
      personal: u.personal,
      holderName: u.holder_name,
      appliedAt: new Date(u.applied_at).toISOString(),
      removedAt: u.removed_at ? new Date(u.removed_at).toISOString() : null,
      removedByName: u.removed_by_name,
    });
    byLock.set(u.lock, list);
  }
  const needle = q.q?.toUpperCase();
  const rows: LockRegisterRow[] = [...byLock.entries()]
    .map(([lockNumber, history]) => {
      const current = history.find((h) => h.removedAt === null) ?? null;
      return { lockNumber, holderName: (current ?? history[0]).holderName, current, uses: history.length, history: history.slice(0, 20) };
    })
    .filter((r) => (q.status === 'applied' ? r.current : q.status === 'free' ? !r.current : true))
    .filter((r) => !needle || r.lockNumber.includes(needle) || r.holderName.toUpperCase().includes(needle))
    .sort((a, b) => Number(!!b.current) - Number(!!a.current) || a.lockNumber.localeCompare(b.lockNumber, 'en', { numeric: true }));
  const start = (q.page - 1) * q.pageSize;
  return { rows: rows.slice(start, start + q.pageSize), total: rows.length, page: q.page, pageSize: q.pageSize };
}
