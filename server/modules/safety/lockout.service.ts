/** A lockout's life: applied, verified, joined and left, handed over and released, each step signed into the chain. */
import type { EntityManager } from '@mikro-orm/postgresql';
import { Membership, User } from '../users/user.entity';
import { WorkOrder } from '../work-orders/work-order.entity';
import { markLockoutApplied, markLockoutReleased } from '../work-orders/work-order-lockout';
import { EnergyProcedure, ProcedureVersion } from './procedure.entity';
import { LockoutMember, LockoutPoint, LockoutSession, type ILockoutPoint, type ILockoutSession } from './lockout.entity';
import { appendSignOff } from './chain';
import { takeOffDevices } from './devices';
import { lockoutAuthorization, requireAuthorized } from './authorization';
import { requireInformedOfRemoval } from './absent-removal.service';
import { refuseDuringTestWindow } from './testing-window.guards';
import { requireNoOutsideLocks } from './outside-locks';
import { mailFedMachinePeople } from './shared-point-mail';
import { badRequest, conflict, fieldError, forbidden, notFound } from '../../http/errors';
import { recordActivity } from '../activity-log/activity-log.service';
import type { Principal } from '../../http/principal';
import {
  LOCK_DEVICE_LABELS,
  type AcceptHandoverInput,
  type ApplyLockoutInput,
  type JoinLockoutInput,
  type OfferHandoverInput,
  type ReleaseLockoutInput,
  type VerifyLockoutInput,
} from '../../../shared/schemas/safety-lockout';
import { ENERGY_KIND_LABELS } from '../../../shared/schemas/safety-procedures';
import { tagJustificationText, tagOnlyJustificationIssues } from '../../../shared/schemas/safety-tag-only';
import { clock } from '../../../shared/clock';

const AUTHORIZED_ROLES = ['technician', 'safety'] as const;
const SUBJECT = 'lockout-session';
const NIL = '00000000-0000-0000-0000-000000000000';

/** Locks already hanging somewhere in this shop, outside personnel's included: a physical lock cannot be in two places. */
export async function locksInUse(tx: EntityManager, orgId: string, numbers: string[], exceptSession?: string): Promise<Map<string, string>> {
  if (numbers.length === 0) return new Map();
  const upper = numbers.map((n) => n.toUpperCase());
  const rows = await tx.execute<{ lock: string; where: string }[]>(
    `select upper(p.lock_number) as lock, m.code || ' (' || p.source_key || ')' as where
       from safety_lockout_point p join safety_lockout s on s.id = p.session_id join machine m on m.id = s.machine_id
      where p.organization_id = ? and p.removed_at is null and p.device not in ('tag-only', 'blocking') and upper(p.lock_number) in (?) and s.id <> ?
     union all
     select upper(lm.lock_number), m.code || ' (personal lock)'
       from safety_lockout_member lm join safety_lockout s on s.id = lm.session_id join machine m on m.id = s.machine_id
      where lm.organization_id = ? and lm.left_at is null and upper(lm.lock_number) in (?) and s.id <> ?
     union all
     select upper(l.n), m.code || ' (' || o.company || ' lock)'
       from safety_outside_party o cross join lateral jsonb_array_elements_text(o.lock_numbers) as l(n)
       join safety_lockout s on s.id = o.session_id join machine m on m.id = s.machine_id
      where o.organization_id = ? and o.locks_applied_at is not null and o.locks_removed_at is null and upper(l.n) in (?) and s.id <> ?`,
    [orgId, upper, exceptSession ?? NIL, orgId, upper, exceptSession ?? NIL, orgId, upper, exceptSession ?? NIL],
  );
  return new Map(rows.map((r) => [r.lock, r.where]));
}

export async function loadOpen(tx: EntityManager, who: Principal, id: string): Promise<ILockoutSession> {
  // Row lock first: two people acting on one lockout at once are applied one after the other.
  await tx.execute('select id from safety_lockout where id = ? and organization_id = ? for update', [id, who.orgId]);
  const s = await tx.findOne(LockoutSession, id, { populate: ['machine', 'primary', 'procedureVersion'] });
  if (!s) throw notFound('Lockout');
  if (s.state === 'released') throw conflict('This lockout was already released');
  return s;
}

function pointLabel(p: Pick<ILockoutPoint, 'sourceKey' | 'lockNumber' | 'device'>) {
  return `${p.sourceKey} ${p.device === 'tag-only' ? 'tag' : 'lock'} ${p.lockNumber}`;
}

export async function applyLockout(em: EntityManager, who: Principal, input: ApplyLockoutInput): Promise<{ id: string; signOffId: string }> {
  return em.transactional(async (tx) => {
    const proc = await tx.findOne(EnergyProcedure, input.procedureId, { populate: ['machine'] });
    if (!proc) throw notFound('Procedure');
    const version = await tx.findOne(ProcedureVersion, { procedure: proc.id, status: 'approved' }, { orderBy: { version: 'desc' } });
    if (!version)
      throw conflict('This procedure has no approved version; the safety officer must approve it before anyone locks out with it', [
        { path: 'procedureId', message: 'No approved version' },
      ]);
    await requireAuthorized(tx, who.userId, proc.id);
    await requireInformedOfRemoval(tx, who.userId);
    const sources = version.content.sources;
    input.points.forEach((p, i) => {
      if (!sources.some((s) => s.key === p.sourceKey))
        throw fieldError(`points.${i}.sourceKey`, `Version ${version.version} of the procedure has no isolation point ${p.sourceKey}`);
    });
    const missing = sources.filter((s) => !input.points.some((p) => p.sourceKey === s.key));
    if (missing.length) {
      throw badRequest(
        `Lock out every energy source the procedure names; missing: ${missing.map((s) => `${s.key} (${ENERGY_KIND_LABELS[s.kind]})`).join(', ')}`,
        [{ path: 'points', message: `Missing: ${missing.map((s) => s.key).join(', ')}` }],
      );
    }
    const unjustified = tagOnlyJustificationIssues(input.points);
    if (unjustified.length)
      throw badRequest(`A tag used alone needs its reason (OSHA 29 CFR 1910.147(c)(3)): ${unjustified.map((f) => f.path).join(', ')}`, unjustified);
    const used = await locksInUse(
      tx,
      who.orgId,
      input.points.filter((p) => p.device !== 'tag-only' && p.device !== 'blocking').map((p) => p.lockNumber),
    );
    input.points.forEach((p, i) => {
      const where = used.get(p.lockNumber.toUpperCase());
      if (where && p.device !== 'tag-only' && p.device !== 'blocking')
        throw conflict(`Lock ${p.lockNumber} is already on ${where}`, [{ path: `points.${i}.lockNumber`, message: `Already on ${where}` }]);
    });
    const machine = proc.machine.getEntity();
    const now = clock.now();
    const session = tx.create(LockoutSession, {
      organization: who.orgId,
      machine,
      procedure: proc,
      procedureVersion: version,
      workOrderId: input.workOrderId ?? null,
      reason: input.reason,
      group: input.group,
      state: 'locked',
      primary: who.userId,
      appliedAt: now,
    });
    for (const p of input.points) {
      tx.create(LockoutPoint, {
        organization: who.orgId,
        session,
        sourceKey: p.sourceKey,
        device: p.device,
        lockNumber: p.lockNumber,
        tagNumber: p.tagNumber || null,
        tagJustification: p.device === 'tag-only' ? (p.tagJustification ?? null) : null,
        tagMeasure: p.device === 'tag-only' && p.tagJustification === 'full-protection' ? p.tagMeasure?.trim() || null : null,
        appliedBy: who.userId,
        holder: who.userId,
        appliedAt: now,
      });
    }
    if (input.workOrderId) {
      const wo = await tx.findOne(WorkOrder, input.workOrderId);
      if (!wo) throw notFound('Work order');
      if (wo.machine.id !== machine.id) throw fieldError('workOrderId', `Work order ${wo.number} is for another machine`);
      if (wo.status === 'done' || wo.status === 'cancelled') throw fieldError('workOrderId', `Work order ${wo.number} is already ${wo.status}`);
      await markLockoutApplied(tx, wo.id, session.id);
    }
    const signOff = await appendSignOff(tx, who, {
      meaning: 'lockout-applied',
      subjectType: SUBJECT,
      subjectId: session.id,
      machineId: machine.id,
      details: {
        summary: `${machine.code} v${version.version}: ${input.points.map((p) => `${p.sourceKey} ${LOCK_DEVICE_LABELS[p.device].toLowerCase()} ${p.lockNumber}${p.tagNumber ? `/${p.tagNumber}` : ''}${p.device === 'tag-only' ? ` — ${tagJustificationText(p.tagJustification, p.tagMeasure)}` : ''}`).join(', ')} — ${input.reason}`,
        procedureId: proc.id,
        procedureVersion: version.version,
        reason: input.reason,
        group: input.group,
        workOrderId: input.workOrderId ?? null,
        points: input.points.map((p) => ({
          key: p.sourceKey,
          device: p.device,
          lock: p.lockNumber,
          tag: p.tagNumber ?? null,
          ...(p.device === 'tag-only'
            ? { tagJustification: p.tagJustification, tagMeasure: p.tagJustification === 'full-protection' ? p.tagMeasure?.trim() : null }
            : {}),
        })),
      },
    });
    recordActivity(tx, who, 'safety.lockout-applied', { type: 'LockoutSession', id: session.id }, { machine: machine.code, signOffId: signOff.id });
    const lockoutInfo = { id: session.id, machineCode: machine.code, machineName: machine.name, reason: input.reason };
    await mailFedMachinePeople(
      tx,
      who,
      lockoutInfo,
      sources,
      input.points.map((p) => p.sourceKey),
      'applied',
      now,
    );
    return { id: session.id, signOffId: signOff.id };
  });
}

export async function activePoints(tx: EntityManager, sessionId: string) {
  return tx.find(LockoutPoint, { session: sessionId, removedAt: null }, { populate: ['holder'], orderBy: { sourceKey: 'asc' } });
}

/** Every active point ticked as tested, and each zero-energy reading with its unit and a proved tester; returns the readings to sign. */
export function checkIsolationTests(points: ILockoutPoint[], input: Pick<VerifyLockoutInput, 'testedPointIds' | 'readings'>) {
  const untested = points.filter((p) => !input.testedPointIds.includes(p.id));
  if (untested.length)
    throw fieldError('testedPointIds', `Test every isolation point before signing; not ticked: ${untested.map((p) => p.sourceKey).join(', ')}`);
  const stray = input.testedPointIds.filter((pid) => !points.some((p) => p.id === pid));
  if (stray.length) throw fieldError('testedPointIds', 'Some ticked points do not belong to this lockout');
  const readings = (input.readings ?? []).map((r, i) => {
    const point = points.find((p) => p.id === r.pointId);
    if (!point) throw fieldError(`readings.${i}.pointId`, 'This reading is for a point that is not on this lockout');
    if (!r.unit)
      throw fieldError(`readings.${i}.unit`, `Give the unit of the reading at ${point.sourceKey} (V, bar …): a number alone does not show zero energy`);
    if (!r.testerProvedBefore || !r.testerProvedAfter)
      throw fieldError(
        `readings.${i}.${r.testerProvedBefore ? 'testerProvedAfter' : 'testerProvedBefore'}`,
        `Prove the tester on a known source before and after the reading at ${point.sourceKey} (live-dead-live, common practice)`,
      );
    return { key: point.sourceKey, value: r.value, unit: r.unit, instrument: r.instrument, testerProvedBefore: true, testerProvedAfter: true };
  });
  return readings;
}

export async function verifyLockout(em: EntityManager, who: Principal, id: string, input: VerifyLockoutInput) {
  return em.transactional(async (tx) => {
    const s = await loadOpen(tx, who, id);
    refuseDuringTestWindow(s, 'verify it here (use the re-verification after testing)');
    if (s.state !== 'locked') throw conflict('Isolation on this lockout is already verified');
    if (s.primary.id !== who.userId) throw forbidden(`Only ${s.primary.getEntity().name}, who holds this lockout, verifies its isolation`);
    const points = await activePoints(tx, s.id);
    const readings = checkIsolationTests(points, input);
    s.state = 'verified';
    const signOff = await appendSignOff(tx, who, {
      meaning: 'isolation-verified',
      subjectType: SUBJECT,
      subjectId: s.id,
      machineId: s.machine.id,
      details: {
        summary: `${s.machine.getEntity().code}: start attempted; zero energy at ${points.map((p) => p.sourceKey).join(', ')}${readings.length ? ` — ${readings.map((r) => `${r.key} ${r.value} ${r.unit}`).join(', ')}` : ''}`,
        points: points.map((p) => p.sourceKey),
        readings,
        startAttempted: true,
      },
      note: input.note ?? null,
    });
    s.verifiedAt = signOff.signedAt;
    recordActivity(tx, who, 'safety.lockout-verified', { type: 'LockoutSession', id: s.id }, { signOffId: signOff.id });
    return { id: s.id, signOffId: signOff.id };
  });
}

export async function joinLockout(em: EntityManager, who: Principal, id: string, input: JoinLockoutInput) {
  return em.transactional(async (tx) => {
    const s = await loadOpen(tx, who, id);
    if (s.primary.id === who.userId) throw conflict('You hold this lockout already; your locks are on the isolation points');
    refuseDuringTestWindow(s, 'join and start work');
    const already = await tx.findOne(LockoutMember, { session: s.id, user: who.userId, leftAt: null });
    if (already) throw conflict(`Your personal lock ${already.lockNumber} is already on this lockout`);
    await requireAuthorized(tx, who.userId, s.procedure.id);
    await requireInformedOfRemoval(tx, who.userId);
    const used = await locksInUse(tx, who.orgId, [input.lockNumber]);
    const where = used.get(input.lockNumber.toUpperCase());
    if (where) throw conflict(`Lock ${input.lockNumber} is already on ${where}`, [{ path: 'lockNumber', message: `Already on ${where}` }]);
    const member = tx.create(LockoutMember, { organization: who.orgId, session: s, user: who.userId, lockNumber: input.lockNumber, joinedAt: clock.now() });
    s.group = true;
    const signOff = await appendSignOff(tx, who, {
      meaning: 'member-joined',
      subjectType: SUBJECT,
      subjectId: s.id,
      machineId: s.machine.id,
      details: {
        summary: `${s.machine.getEntity().code}: personal lock ${input.lockNumber} on the group lockout held by ${s.primary.getEntity().name}`,
        lock: input.lockNumber,
        memberId: member.id,
      },
    });
    member.joinedAt = signOff.signedAt;
    recordActivity(tx, who, 'safety.lockout-joined', { type: 'LockoutSession', id: s.id }, { signOffId: signOff.id });
    return { id: member.id, signOffId: signOff.id };
  });
}

export async function leaveLockout(em: EntityManager, who: Principal, id: string) {
  return em.transactional(async (tx) => {
    const s = await loadOpen(tx, who, id);
    const member = await tx.findOne(LockoutMember, { session: s.id, user: who.userId, leftAt: null });
    if (!member) throw conflict('You have no personal lock on this lockout; only the person whose lock it is removes it');
    const signOff = await appendSignOff(tx, who, {
      meaning: 'member-left',
      subjectType: SUBJECT,
      subjectId: s.id,
      machineId: s.machine.id,
      details: { summary: `${s.machine.getEntity().code}: personal lock ${member.lockNumber} removed`, lock: member.lockNumber, memberId: member.id },
    });
    member.leftAt = signOff.signedAt;
    recordActivity(tx, who, 'safety.lockout-left', { type: 'LockoutSession', id: s.id }, { signOffId: signOff.id });
    return { signOffId: signOff.id };
  });
}

/** Shift hand-over, step 1 (1910.147(f)(4)): the off-going holder names who takes over; their locks stay on. */
export async function offerHandover(em: EntityManager, who: Principal, id: string, input: OfferHandoverInput) {
  return em.transactional(async (tx) => {
    const s = await loadOpen(tx, who, id);
    if (s.primary.id !== who.userId) throw forbidden(`Only ${s.primary.getEntity().name}, who holds this lockout, can hand it over`);
    refuseDuringTestWindow(s, 'hand it over');
    if (input.toUserId === who.userId) throw fieldError('toUserId', 'Choose someone else to take over');
    const m = await tx.findOne(Membership, { user: input.toUserId, organization: who.orgId, active: true }, { filters: false, populate: ['user'] });
    if (!m) throw fieldError('toUserId', 'This person is not an active member of your shop');
    if (!(AUTHORIZED_ROLES as readonly string[]).includes(m.role))
      throw fieldError('toUserId', `${m.user.getEntity().name} is not an authorized employee (technician or safety officer) and cannot hold a lockout`);
    const auth = await lockoutAuthorization(tx, input.toUserId, s.procedure.id);
    if (!auth.authorized) throw fieldError('toUserId', auth.reason ?? 'Not authorized on this procedure');
    s.pendingHandoverTo = tx.getReference(User, input.toUserId, { wrapped: true });
    const signOff = await appendSignOff(tx, who, {
      meaning: 'handover-offered',
      subjectType: SUBJECT,
      subjectId: s.id,
      machineId: s.machine.id,
      details: {
        summary: `${s.machine.getEntity().code}: handing over to ${m.user.getEntity().name}`,
        toUserId: input.toUserId,
        toName: m.user.getEntity().name,
      },
      note: input.note ?? null,
    });
    recordActivity(tx, who, 'safety.lockout-handover-offered', { type: 'LockoutSession', id: s.id }, { to: input.toUserId, signOffId: signOff.id });
    return { signOffId: signOff.id };
  });
}

/** Step 2: the oncoming person puts their own lock on every point; the off-going locks come off in the same record. */
export async function acceptHandover(em: EntityManager, who: Principal, id: string, input: AcceptHandoverInput) {
  return em.transactional(async (tx) => {
    const s = await loadOpen(tx, who, id);
    if (s.pendingHandoverTo?.id !== who.userId) throw forbidden('No hand-over of this lockout is waiting for you');
    await requireAuthorized(tx, who.userId, s.procedure.id);
    const from = s.primary.getEntity();
    const points = await activePoints(tx, s.id);
    const mine = points.filter((p) => p.holder.id === from.id);
    const missing = mine.filter((p) => !input.locks.some((l) => l.pointId === p.id));
    if (missing.length)
      throw fieldError('locks', `Put your own lock on every point before taking over; missing: ${missing.map((p) => p.sourceKey).join(', ')}`);
    const numbers = input.locks.map((l) => l.lockNumber.toUpperCase());
    if (new Set(numbers).size !== numbers.length) throw fieldError('locks', 'Each point needs its own lock');
    const used = await locksInUse(
      tx,
      who.orgId,
      input.locks.map((l) => l.lockNumber),
      s.id,
    );
    for (const l of input.locks) {
      const where = used.get(l.lockNumber.toUpperCase());
      if (where) throw conflict(`Lock ${l.lockNumber} is already on ${where}`, [{ path: 'locks', message: `Lock ${l.lockNumber} already on ${where}` }]);
    }
    const now = clock.now();
    const swaps: { key: string; from: string; to: string }[] = [];
    for (const p of mine) {
      const lock = input.locks.find((l) => l.pointId === p.id)!;
      p.removedAt = now;
      p.removedBy = tx.getReference(User, from.id, { wrapped: true });
      tx.create(LockoutPoint, {
        organization: who.orgId,
        session: s,
        sourceKey: p.sourceKey,
        device: p.device,
        lockNumber: lock.lockNumber,
        tagNumber: p.tagNumber,
        tagJustification: p.tagJustification ?? null,
        tagMeasure: p.tagMeasure ?? null,
        appliedBy: who.userId,
        holder: who.userId,
        appliedAt: now,
      });
      swaps.push({ key: p.sourceKey, from: p.lockNumber, to: lock.lockNumber });
    }
    s.primary = tx.getReference(User, who.userId, { wrapped: true });
    s.pendingHandoverTo = null;
    const signOff = await appendSignOff(tx, who, {
      meaning: 'handover-accepted',
      subjectType: SUBJECT,
      subjectId: s.id,
      machineId: s.machine.id,
      details: {
        summary: `${s.machine.getEntity().code}: taken over from ${from.name}; ${swaps.map((x) => `${x.key} ${x.from} → ${x.to}`).join(', ')}`,
        fromUserId: from.id,
        fromName: from.name,
        locks: swaps,
      },
    });
    recordActivity(tx, who, 'safety.lockout-handover-accepted', { type: 'LockoutSession', id: s.id }, { from: from.id, signOffId: signOff.id });
    return { signOffId: signOff.id };
  });
}

/** Release (1910.147(e)): only the holder of every remaining device, after every member has taken their lock off. */
export async function releaseLockout(em: EntityManager, who: Principal, id: string, input: ReleaseLockoutInput) {
  return em.transactional(async (tx) => {
    const s = await loadOpen(tx, who, id);
    refuseDuringTestWindow(s, 'release it', true);
    const points = await activePoints(tx, s.id);
    const others = points.filter((p) => p.holder.id !== who.userId);
    if (others.length) {
      throw forbidden(
        `Only the person who applied a lock removes it (OSHA 29 CFR 1910.147(e)(3)): ${others.map((p) => `${pointLabel(p)} belongs to ${p.holder.getEntity().name}`).join('; ')}. If they are away from the facility, a supervisor uses the absent-employee removal steps.`,
      );
    }
    const members = await tx.find(LockoutMember, { session: s.id, leftAt: null }, { populate: ['user'], orderBy: { joinedAt: 'asc' } });
    if (members.length) {
      throw conflict(
        `Personal locks are still on this group lockout: ${members.map((m) => `${m.user.getEntity().name} (${m.lockNumber})`).join(', ')}. Each person removes their own lock first.`,
      );
    }
    await requireNoOutsideLocks(tx, s.id);
    if (s.pendingHandoverTo) throw conflict('A hand-over is waiting to be accepted; it must be accepted before the lockout can be released');
    const now = takeOffDevices(tx, points, who.userId);
    s.state = 'released';
    const machine = s.machine.getEntity();
    const signOff = await appendSignOff(tx, who, {
      meaning: 'lockout-released',
      subjectType: SUBJECT,
      subjectId: s.id,
      machineId: machine.id,
      details: {
        summary: `${machine.code}: area checked, people clear, affected employees told; removed ${points.map(pointLabel).join(', ')}`,
        areaChecked: true,
        peopleClear: true,
        affectedNotified: true,
        removed: points.map((p) => ({ key: p.sourceKey, lock: p.lockNumber })),
        workOrderId: s.workOrderId ?? null,
      },
      note: input.note ?? null,
    });
    s.releasedAt = signOff.signedAt;
    if (s.workOrderId) await markLockoutReleased(tx, s.workOrderId, signOff.signedAt);
    recordActivity(tx, who, 'safety.lockout-released', { type: 'LockoutSession', id: s.id }, { signOffId: signOff.id });
    const lockoutInfo = { id: s.id, machineCode: machine.code, machineName: machine.name, reason: s.reason };
    await mailFedMachinePeople(
      tx,
      who,
      lockoutInfo,
      s.procedureVersion.getEntity().content.sources,
      points.map((p) => p.sourceKey),
      'released',
      now,
    );
    return { id: s.id, signOffId: signOff.id };
  });
}
