import type { EntityManager } from '@mikro-orm/postgresql';

/**
 * An open lockout that reaches a machine through a shared isolation point: the point is on another
 * machine's procedure, lists this machine among those it feeds, and its lock is on (applied, not
 * removed) while the lockout is open (during a test window its devices are off, so it does not count).
 */
export type FedLockout = {
  fedMachineId: string;
  lockoutId: string;
  /** The machine the lockout is on (the hydraulic unit), and the shared point. */
  machineCode: string;
  pointKey: string;
  state: 'locked' | 'verified' | 'testing' | 'reapplied';
  appliedAt: Date;
  reason: string;
  /** Whose lock is on the shared point. */
  heldBy: string;
};

type Row = {
  fed_id: string;
  lockout_id: string;
  code: string;
  point_key: string;
  state: 'locked' | 'verified' | 'testing' | 'reapplied';
  applied_at: Date;
  reason: string;
  held_by: string;
};

/**
 * One set-based query for any number of machines (lists and station pages stay at a fixed number
 * of queries). Raw SQL bypasses the ORM's shop filter, so the organization is named here when the
 * caller knows it, and the fed machine must always be of the lockout's own shop.
 */
export async function fedLockouts(em: EntityManager, orgId: string | null, machineIds: string[]): Promise<FedLockout[]> {
  if (machineIds.length === 0) return [];
  const rows = await em.execute<Row[]>(
    `select distinct on (f.id, l.id, p.source_key) f.id as fed_id, l.id as lockout_id, m.code, p.source_key as point_key, l.state, l.applied_at, l.reason, u.name as held_by
       from safety_lockout l
       join machine m on m.id = l.machine_id
       join safety_procedure_version v on v.id = l.procedure_version_id
       cross join lateral jsonb_array_elements(v.content->'sources') s
       cross join lateral jsonb_array_elements_text(coalesce(s->'feeds', '[]'::jsonb)) f(id)
       join safety_lockout_point p on p.session_id = l.id and p.source_key = s->>'key' and p.removed_at is null
       join app_user u on u.id = p.holder_id
       join machine fm on fm.id::text = f.id and fm.organization_id = l.organization_id
      where (?::uuid is null or l.organization_id = ?::uuid) and l.state <> 'released' and l.released_at is null
        and f.id = any(?::text[]) and f.id <> l.machine_id::text
      order by f.id, l.id, p.source_key, p.applied_at`,
    [orgId, orgId, `{${machineIds.join(',')}}`],
  );
  return rows
    .map((r) => ({
      fedMachineId: r.fed_id,
      lockoutId: r.lockout_id,
      machineCode: r.code,
      pointKey: r.point_key,
      state: r.state,
      appliedAt: new Date(r.applied_at),
      reason: r.reason,
      heldBy: r.held_by,
    }))
    .sort((a, b) => a.appliedAt.getTime() - b.appliedAt.getTime());
}

/** The reason a fed machine shows, e.g. "H1-E2 on H1 locked out: Hose replacement". */
export const fedReason = (l: Pick<FedLockout, 'pointKey' | 'machineCode' | 'reason'>) => `${l.pointKey} on ${l.machineCode} locked out: ${l.reason}`;
