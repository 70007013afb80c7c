/** Reading lockouts: the list and one lockout with its points, members and signatures. */
import type { EntityManager } from '@mikro-orm/postgresql';
import { LockoutMember, LockoutPoint, LockoutSession } from './lockout.entity';
import { SafetySignOff } from './sign-off.entity';
import { notFound } from '../../http/errors';
import type { Principal } from '../../http/principal';
import type { Page } from '../../../shared/schemas/paging';
import type { ListLockoutsQuery, LockoutDetail, LockoutRow } from '../../../shared/schemas/safety-lockout';
import { ENERGY_KIND_LABELS } from '../../../shared/schemas/safety-procedures';

const iso = (d: Date | null | undefined) => (d ? d.toISOString() : null);

const rowSql = `select s.id, s.state, s.machine_id, m.code as machine_code, m.name as machine_name, s.reason, s."group", s.primary_id, u.name as primary_name,
    v.version as procedure_version, s.work_order_id, s.applied_at, s.verified_at, s.released_at, s.procedure_id,
    (select count(*) from safety_lockout_member lm where lm.session_id = s.id and lm.left_at is null) as active_members, count(*) over () as total
  from safety_lockout s join machine m on m.id = s.machine_id join app_user u on u.id = s.primary_id join safety_procedure_version v on v.id = s.procedure_version_id`;

type RowSql = {
  id: string;
  state: LockoutRow['state'];
  machine_id: string;
  machine_code: string;
  machine_name: string;
  reason: string;
  group: boolean;
  primary_id: string;
  primary_name: string;
  procedure_version: number;
  work_order_id: string | null;
  applied_at: Date;
  verified_at: Date | null;
  released_at: Date | null;
  procedure_id: string;
  active_members: string;
  total: string;
};

const toRow = (r: RowSql): LockoutRow => ({
  id: r.id,
  state: r.state,
  machineId: r.machine_id,
  machineCode: r.machine_code,
  machineName: r.machine_name,
  reason: r.reason,
  group: r.group,
  primaryId: r.primary_id,
  primaryName: r.primary_name,
  procedureVersion: Number(r.procedure_version),
  workOrderId: r.work_order_id,
  appliedAt: new Date(r.applied_at).toISOString(),
  verifiedAt: r.verified_at ? new Date(r.verified_at).toISOString() : null,
  releasedAt: r.released_at ? new Date(r.released_at).toISOString() : null,
  activeMembers: Number(r.active_members),
});

export async function listLockouts(em: EntityManager, who: Principal, q: ListLockoutsQuery): Promise<Page<LockoutRow>> {
  const params: unknown[] = [who.orgId];
  let where = 's.organization_id = ?';
  if (q.state === 'open') where += ` and s.state <> 'released'`;
  else if (q.state) {
    where += ' and s.state = ?';
    params.push(q.state);
  }
  if (q.machineId) {
    where += ' and s.machine_id = ?';
    params.push(q.machineId);
  }
  const rows = await em
    .getConnection()
    .execute<RowSql[]>(`${rowSql} where ${where} order by (s.state = 'released'), s.applied_at desc limit ? offset ?`, [
      ...params,
      q.pageSize,
      (q.page - 1) * q.pageSize,
    ]);
  return { rows: rows.map(toRow), total: rows[0] ? Number(rows[0].total) : 0, page: q.page, pageSize: q.pageSize };
}

export async function getLockout(em: EntityManager, who: Principal, id: string): Promise<LockoutDetail> {
  const [r] = await em.getConnection().execute<RowSql[]>(`${rowSql} where s.organization_id = ? and s.id = ?`, [who.orgId, id]);
  if (!r) throw notFound('Lockout');
  const session = await em.findOneOrFail(LockoutSession, id, { populate: ['pendingHandoverTo', 'procedureVersion'] });
  const points = await em.find(
    LockoutPoint,
    { session: id },
    { populate: ['holder', 'appliedBy', 'removedBy'], orderBy: { appliedAt: 'asc', sourceKey: 'asc' } },
  );
  const members = await em.find(LockoutMember, { session: id }, { populate: ['user'], orderBy: { joinedAt: 'asc' } });
  // Outside personnel's steps are signed on their own record; they belong to this lockout's story too.
  const parties = await em.getConnection().execute<{ id: string }[]>('select id from safety_outside_party where session_id = ?', [id]);
  const signOffs = await em.find(SafetySignOff, { subjectId: { $in: [id, ...parties.map((x) => x.id)] } }, { orderBy: { seq: 'asc' } });
  const sources = session.procedureVersion.getEntity().content.sources;
  // Points in the procedure's order (as on the placard), the newest device of each point first.
  const order = (k: string) => sources.findIndex((x) => x.key === k);
  points.sort((a, b) => order(a.sourceKey) - order(b.sourceKey) || Number(a.removedAt !== null) - Number(b.removedAt !== null));
  return {
    ...toRow(r),
    procedureId: r.procedure_id,
    pendingHandoverToId: session.pendingHandoverTo?.id ?? null,
    pendingHandoverToName: session.pendingHandoverTo?.getEntity().name ?? null,
    points: points.map((p) => {
      const src = sources.find((x) => x.key === p.sourceKey);
      return {
        id: p.id,
        sourceKey: p.sourceKey,
        sourceKind: src ? ENERGY_KIND_LABELS[src.kind] : '?',
        isolationDevice: src?.isolationDevice ?? '?',
        location: src?.location ?? '?',
        device: p.device,
        lockNumber: p.lockNumber,
        tagNumber: p.tagNumber ?? null,
        tagJustification: p.tagJustification ?? null,
        tagMeasure: p.tagMeasure ?? null,
        holderId: p.holder.id,
        holderName: p.holder.getEntity().name,
        appliedByName: p.appliedBy.getEntity().name,
        appliedAt: p.appliedAt.toISOString(),
        removedAt: iso(p.removedAt),
        removedByName: p.removedBy?.getEntity().name ?? null,
      };
    }),
    members: members.map((m) => ({
      id: m.id,
      userId: m.user.id,
      name: m.user.getEntity().name,
      lockNumber: m.lockNumber,
      joinedAt: m.joinedAt.toISOString(),
      leftAt: iso(m.leftAt),
    })),
    signOffs: signOffs.map((x) => ({
      id: x.id,
      seq: x.seq,
      signedAt: x.signedAt.toISOString(),
      signerName: x.signerName,
      meaning: x.meaning,
      statement: x.statement,
    })),
  };
}
