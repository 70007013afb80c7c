/**
 * Temporary removal of lockout devices to test or position the machine (OSHA 29 CFR 1910.147(f)(1)),
 * in three signed steps by the person who holds the lockout: open the window (devices off), reapply
 * the devices, verify isolation again. Work resumes only after the third.
 */
import type { EntityManager } from '@mikro-orm/postgresql';
import { LockoutMember, LockoutPoint, LockoutSession, type ILockoutSession } from './lockout.entity';
import { LockoutTestWindow } from './testing-window.entity';
import { activePoints, checkIsolationTests, locksInUse } from './lockout.service';
import { takeOffDevices } from './devices';
import { appendSignOff } from './chain';
import { conflict, fieldError, forbidden, notFound } from '../../http/errors';
import { recordActivity } from '../activity-log/activity-log.service';
import type { Principal } from '../../http/principal';
import { clock } from '../../../shared/clock';
import type { LockoutState } from '../../../shared/schemas/safety-lockout';
import {
  TEST_WINDOW_PURPOSE_LABELS,
  type OpenTestWindowInput,
  type ReapplyAfterTestInput,
  type ReverifyAfterTestInput,
  type TestWindowRow,
} from '../../../shared/schemas/safety-testing-window';

const SUBJECT = 'lockout-session';
const lockBearing = (device: string) => device !== 'tag-only' && device !== 'blocking';

/** The lockout, row-locked, held by the signer and in the state the step needs; each refusal names the field. */
async function loadForStep(tx: EntityManager, who: Principal, id: string, needs: LockoutState, stepWords: string): Promise<ILockoutSession> {
  await tx.execute('select id from safety_lockout where id = ? and organization_id = ? for update', [id, who.orgId]);
  const s = await tx.findOne(LockoutSession, id, { populate: ['machine', 'primary'] });
  if (!s) throw notFound('Lockout');
  if (s.state === 'released') throw conflict('This lockout was already released', [{ path: 'state', message: 'Released' }]);
  if (s.primary.id !== who.userId)
    throw forbidden(`Only ${s.primary.getEntity().name}, who holds this lockout, can ${stepWords} (OSHA 29 CFR 1910.147(e)(3), (f)(1))`);
  if (s.state !== needs) {
    const why: Record<LockoutState, string> = {
      locked: 'Isolation on this lockout is not verified yet: verify it before the devices come off for testing',
      verified: 'No test or positioning window is open on this lockout',
      released: 'This lockout was already released',
      testing: 'The devices are off for testing or positioning: put them back on first',
      reapplied: 'The devices are back on after testing: verify isolation again first',
    };
    const message = why[s.state as LockoutState];
    throw conflict(message, [{ path: 'state', message }]);
  }
  return s;
}

async function openWindow(tx: EntityManager, sessionId: string) {
  const w = await tx.findOne(LockoutTestWindow, { session: sessionId, reverifiedAt: null }, { orderBy: { openedAt: 'desc' } });
  if (!w) throw conflict('No test or positioning window is open on this lockout', [{ path: 'state', message: 'No window open' }]);
  return w;
}

/** (f)(1)(i)-(iii): machine cleared, employees out of the area, the chosen devices removed by their holder. */
export async function openTestWindow(em: EntityManager, who: Principal, id: string, input: OpenTestWindowInput) {
  return em.transactional(async (tx) => {
    const s = await loadForStep(tx, who, id, 'verified', 'take devices off for testing or positioning');
    if (s.pendingHandoverTo) throw conflict('A hand-over is waiting; finish it before the devices come off', [{ path: 'state', message: 'Hand-over waiting' }]);
    // Checked here rather than at the edge so that a missing confirmation is a refusal in the safety audit.
    if (!input.machineCleared) throw fieldError('machineCleared', 'Clear the machine of tools and materials first (1910.147(f)(1)(i))');
    if (!input.employeesRemoved) throw fieldError('employeesRemoved', 'Remove employees from the machine area first (1910.147(f)(1)(ii))');
    // Group lockout (1910.147(f)(3)): members' personal locks hang on the group lockout, not on the
    // isolation points, so they stay on through the window and keep the lockout from being released.
    // Energizing puts those members at risk, though: either every member has signed off, or the
    // holder confirms each one still listed is out of the machine area for the window.
    const members = await tx.find(LockoutMember, { session: s.id, leftAt: null }, { populate: ['user'], orderBy: { joinedAt: 'asc' } });
    if (members.length && !input.membersClear)
      throw fieldError(
        'membersClear',
        `Personal locks are still on this group lockout (${members.map((m) => `${m.user.getEntity().name} ${m.lockNumber}`).join(', ')}): confirm each of them is out of the machine area, or they remove their locks first`,
      );
    const points = await activePoints(tx, s.id);
    if (new Set(input.removePointIds).size !== input.removePointIds.length) throw fieldError('removePointIds', 'A point is listed twice');
    const removing = input.removePointIds.map((pid, i) => {
      const p = points.find((x) => x.id === pid);
      if (!p) throw fieldError(`removePointIds.${i}`, 'This device is not on this lockout now');
      if (p.holder.id !== who.userId)
        throw forbidden(
          `Only the person who applied a device removes it (1910.147(e)(3)): ${p.sourceKey} lock ${p.lockNumber} belongs to ${p.holder.getEntity().name}`,
        );
      return p;
    });
    takeOffDevices(tx, removing, who.userId);
    s.state = 'testing';
    const machine = s.machine.getEntity();
    const removed = removing.map((p) => ({ pointId: p.id, sourceKey: p.sourceKey, lockNumber: p.lockNumber }));
    const signOff = await appendSignOff(tx, who, {
      meaning: 'testing-window-opened',
      subjectType: SUBJECT,
      subjectId: s.id,
      machineId: machine.id,
      details: {
        summary: `${machine.code}: ${TEST_WINDOW_PURPOSE_LABELS[input.purpose].toLowerCase()} — ${input.reason}; removed ${removed.map((r) => `${r.sourceKey} ${r.lockNumber}`).join(', ')}`,
        purpose: input.purpose,
        reason: input.reason,
        machineCleared: true,
        employeesRemoved: true,
        membersClear: members.length ? true : null,
        membersStillOn: members.map((m) => ({ name: m.user.getEntity().name, lock: m.lockNumber })),
        removed: removed.map((r) => ({ key: r.sourceKey, lock: r.lockNumber })),
      },
    });
    const window = tx.create(LockoutTestWindow, {
      organization: who.orgId,
      session: s,
      purpose: input.purpose,
      reason: input.reason,
      membersClear: members.length > 0,
      removed,
      openedAt: signOff.signedAt,
      openedBy: who.userId,
      openSignOffId: signOff.id,
    });
    recordActivity(tx, who, 'safety.lockout-test-window-opened', { type: 'LockoutSession', id: s.id }, { windowId: window.id, signOffId: signOff.id });
    return { id: window.id, signOffId: signOff.id };
  });
}

/** (f)(1)(v), first half: de-energized, and a device back on every point that came off. */
export async function reapplyAfterTest(em: EntityManager, who: Principal, id: string, input: ReapplyAfterTestInput) {
  return em.transactional(async (tx) => {
    const s = await loadForStep(tx, who, id, 'testing', 'put the devices back on');
    const window = await openWindow(tx, s.id);
    if (!input.deEnergized) throw fieldError('deEnergized', 'Stop the machine and de-energize it before the devices go back on (1910.147(f)(1)(v))');
    input.locks.forEach((l, i) => {
      if (!window.removed.some((r) => r.pointId === l.pointId)) throw fieldError(`locks.${i}.pointId`, 'This point did not come off in this window');
    });
    const missing = window.removed.filter((r) => !input.locks.some((l) => l.pointId === r.pointId));
    if (missing.length)
      throw fieldError('locks', `Put a device back on every point that came off before work resumes; missing: ${missing.map((r) => r.sourceKey).join(', ')}`);
    const old = await tx.find(LockoutPoint, { id: { $in: window.removed.map((r) => r.pointId) } });
    const deviceOf = (pointId: string) => old.find((p) => p.id === pointId)!;
    const withLocks = input.locks.filter((l) => lockBearing(deviceOf(l.pointId).device));
    const numbers = withLocks.map((l) => l.lockNumber.toUpperCase());
    if (new Set(numbers).size !== numbers.length) throw fieldError('locks', 'Each point needs its own lock');
    // No session excluded: a lock still on another point of this lockout, or a member's personal lock, is in use too.
    const used = await locksInUse(
      tx,
      who.orgId,
      withLocks.map((l) => l.lockNumber),
    );
    input.locks.forEach((l, i) => {
      const where = used.get(l.lockNumber.toUpperCase());
      if (where && lockBearing(deviceOf(l.pointId).device))
        throw conflict(`Lock ${l.lockNumber} is already on ${where}`, [{ path: `locks.${i}.lockNumber`, message: `Already on ${where}` }]);
    });
    const now = clock.now();
    const applied = input.locks.map((l) => {
      const before = deviceOf(l.pointId);
      tx.create(LockoutPoint, {
        organization: who.orgId,
        session: s,
        sourceKey: before.sourceKey,
        device: before.device,
        lockNumber: l.lockNumber,
        tagNumber: l.tagNumber || before.tagNumber || null,
        appliedBy: who.userId,
        holder: who.userId,
        appliedAt: now,
      });
      return { key: before.sourceKey, device: before.device, lock: l.lockNumber };
    });
    s.state = 'reapplied';
    const machine = s.machine.getEntity();
    const signOff = await appendSignOff(tx, who, {
      meaning: 'energy-control-reapplied',
      subjectType: SUBJECT,
      subjectId: s.id,
      machineId: machine.id,
      details: {
        summary: `${machine.code}: de-energized; devices back on ${applied.map((a) => `${a.key} ${a.lock}`).join(', ')}`,
        windowId: window.id,
        deEnergized: true,
        applied,
      },
    });
    window.reappliedAt = signOff.signedAt;
    window.reapplySignOffId = signOff.id;
    recordActivity(tx, who, 'safety.lockout-test-reapplied', { type: 'LockoutSession', id: s.id }, { windowId: window.id, signOffId: signOff.id });
    return { signOffId: signOff.id };
  });
}

/** (f)(1)(v), second half: start attempted and zero energy at every point again; work may resume. */
export async function reverifyAfterTest(em: EntityManager, who: Principal, id: string, input: ReverifyAfterTestInput) {
  return em.transactional(async (tx) => {
    const s = await loadForStep(tx, who, id, 'reapplied', 'verify isolation after testing');
    const window = await openWindow(tx, s.id);
    const points = await activePoints(tx, s.id);
    const readings = checkIsolationTests(points, input);
    s.state = 'verified';
    const machine = s.machine.getEntity();
    const signOff = await appendSignOff(tx, who, {
      meaning: 'isolation-reverified',
      subjectType: SUBJECT,
      subjectId: s.id,
      machineId: machine.id,
      details: {
        summary: `${machine.code}: after testing, start attempted; zero energy at ${points.map((p) => p.sourceKey).join(', ')}${readings.length ? ` — ${readings.map((r) => `${r.key} ${r.value} ${r.unit}`).join(', ')}` : ''}`,
        windowId: window.id,
        points: points.map((p) => p.sourceKey),
        readings,
        startAttempted: true,
      },
      note: input.note ?? null,
    });
    // The lockout's first verification time stays; this window's end starts the next verified interval.
    window.reverifiedAt = signOff.signedAt;
    window.reverifySignOffId = signOff.id;
    recordActivity(tx, who, 'safety.lockout-test-reverified', { type: 'LockoutSession', id: s.id }, { windowId: window.id, signOffId: signOff.id });
    return { signOffId: signOff.id };
  });
}

export async function listTestWindows(em: EntityManager, id: string): Promise<TestWindowRow[]> {
  const s = await em.findOne(LockoutSession, id);
  if (!s) throw notFound('Lockout');
  const rows = await em.find(LockoutTestWindow, { session: id }, { populate: ['openedBy'], orderBy: { openedAt: 'desc' } });
  return rows.map((w) => ({
    id: w.id,
    purpose: w.purpose,
    reason: w.reason,
    openedAt: w.openedAt.toISOString(),
    openedByName: w.openedBy.getEntity().name,
    membersClear: w.membersClear,
    removed: w.removed,
    reappliedAt: w.reappliedAt?.toISOString() ?? null,
    reverifiedAt: w.reverifiedAt?.toISOString() ?? null,
  }));
}
