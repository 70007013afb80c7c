/**
 * Removing an absent employee's locks, OSHA 29 CFR 1910.147(e)(3): the only way anyone other than
 * the person who applied a lock takes it off. Each step is signed into the chain on its own, in order:
 * absence verified and contact attempted (supervisor), removal authorized (the safety officer, a
 * different person), locks removed (supervisor), employee informed before resuming work.
 */
import type { EntityManager } from '@mikro-orm/postgresql';
import { User } from '../users/user.entity';
import { AbsentLockRemoval, type IAbsentLockRemoval } from './absent-removal.entity';
import { LockoutMember, LockoutPoint, LockoutSession } from './lockout.entity';
import { appendSignOff } from './chain';
import { takeOffDevices } from './devices';
import { requireNoOutsideLocks } from './outside-locks';
import { conflict, fieldError, forbidden, notFound } from '../../http/errors';
import { recordActivity } from '../activity-log/activity-log.service';
import { markLockoutReleased } from '../work-orders/work-order-lockout';
import type { Principal } from '../../http/principal';
import {
  ABSENT_REMOVAL_STEPS,
  ABSENT_STEP_LABELS,
  type AbsentRemovalRow,
  type AbsentRemovalStep,
  type AbsentStepInput,
  type StartAbsentRemovalInput,
} from '../../../shared/schemas/safety-absent-removal';
import type { SignMeaning } from '../../../shared/schemas/safety-sign-offs';

const MEANING: Record<AbsentRemovalStep, SignMeaning> = {
  'absence-verified': 'absence-verified',
  'contact-attempted': 'contact-attempted',
  'removal-authorized': 'removal-authorized',
  'locks-removed': 'absent-locks-removed',
  'employee-informed': 'employee-informed',
};

async function lockedSession(tx: EntityManager, orgId: string, id: string) {
  await tx.execute('select id from safety_lockout where id = ? and organization_id = ? for update', [id, orgId]);
  const s = await tx.findOne(LockoutSession, id, { populate: ['machine', 'primary'] });
  if (!s) throw notFound('Lockout');
  return s;
}

async function absentLocks(tx: EntityManager, sessionId: string, userId: string) {
  const points = await tx.find(LockoutPoint, { session: sessionId, holder: userId, removedAt: null }, { orderBy: { sourceKey: 'asc' } });
  const member = await tx.findOne(LockoutMember, { session: sessionId, user: userId, leftAt: null });
  return { points, member };
}

function nextStep(step: AbsentRemovalStep): AbsentRemovalStep | null {
  return ABSENT_REMOVAL_STEPS[ABSENT_REMOVAL_STEPS.indexOf(step) + 1] ?? null;
}

/** Step 1, 1910.147(e)(3)(i): the supervisor verifies the employee is not at the facility. */
export async function startAbsentRemoval(em: EntityManager, who: Principal, lockoutId: string, input: StartAbsentRemovalInput) {
  return em.transactional(async (tx) => {
    const s = await lockedSession(tx, who.orgId, lockoutId);
    if (s.state === 'released') throw conflict('This lockout was already released');
    if (input.absentUserId === who.userId) throw fieldError('absentUserId', 'These are your own locks: remove them yourself with the release or leave step');
    const absent = await tx.findOne(User, input.absentUserId, { filters: false });
    const { points, member } = await absentLocks(tx, s.id, input.absentUserId);
    if (!absent || (points.length === 0 && !member)) throw fieldError('absentUserId', 'This person has no lock on this lockout');
    const open = await tx.findOne(AbsentLockRemoval, { session: s.id, absentUser: input.absentUserId, step: { $ne: 'employee-informed' } });
    if (open) throw conflict(`A removal of ${absent.name}'s locks is already under way on this lockout`);
    const locks = [...points.map((p) => ({ key: p.sourceKey, lock: p.lockNumber })), ...(member ? [{ key: 'personal', lock: member.lockNumber }] : [])];
    const removal = tx.create(AbsentLockRemoval, {
      organization: who.orgId,
      session: s,
      absentUser: absent,
      supervisor: who.userId,
      step: 'absence-verified',
      steps: {},
      locks,
    });
    const signOff = await appendSignOff(tx, who, {
      meaning: 'absence-verified',
      subjectType: 'absent-lock-removal',
      subjectId: removal.id,
      machineId: s.machine.id,
      details: {
        summary: `${s.machine.getEntity().code}: ${absent.name} is not at the facility; their locks ${locks.map((l) => l.lock).join(', ')} (${ABSENT_STEP_LABELS['absence-verified'].source})`,
        lockoutId: s.id,
        absentUserId: absent.id,
        absentName: absent.name,
        locks,
        how: input.note,
      },
      note: input.note,
    });
    removal.steps = {
      'absence-verified': { signOffId: signOff.id, signerId: who.userId, signerName: who.name, at: signOff.signedAt.toISOString(), note: input.note },
    };
    recordActivity(tx, who, 'safety.absent-removal-started', { type: 'LockoutSession', id: s.id }, { absent: absent.id, signOffId: signOff.id });
    return { id: removal.id, signOffId: signOff.id };
  });
}

/** The later steps, each in order and each by the person the procedure names. */
export async function signAbsentStep(em: EntityManager, who: Principal, removalId: string, input: AbsentStepInput) {
  return em.transactional(async (tx) => {
    await tx.execute('select id from safety_absent_removal where id = ? and organization_id = ? for update', [removalId, who.orgId]);
    const r = await tx.findOne(AbsentLockRemoval, removalId, { populate: ['absentUser', 'supervisor'] });
    if (!r) throw notFound('Lock removal');
    const expected = nextStep(r.step);
    if (!expected) throw conflict('Every step of this removal is already signed');
    if (input.step !== expected)
      throw fieldError('step', `Steps are signed in order: next is “${ABSENT_STEP_LABELS[expected].title}” (${ABSENT_STEP_LABELS[expected].source})`);
    const supervisorName = r.supervisor.getEntity().name;
    if (expected === 'removal-authorized') {
      if (who.role !== 'safety') throw forbidden('Only the safety officer authorizes removing an absent employee’s locks');
      if (who.userId === r.supervisor.id)
        throw forbidden('The safety officer who authorizes the removal must be someone other than the supervisor who removes the locks');
    } else if (expected !== 'employee-informed' && who.userId !== r.supervisor.id) {
      throw forbidden(`${supervisorName}, who started this removal, signs this step`);
    } else if (expected === 'employee-informed' && who.userId !== r.supervisor.id && who.role !== 'safety') {
      throw forbidden(`${supervisorName} or the safety officer tells the employee and signs this step`);
    }
    const s = await lockedSession(tx, who.orgId, r.session.id);
    const absent = r.absentUser.getEntity();
    const details: Record<string, unknown> & { summary: string } = {
      summary: `${s.machine.getEntity().code}: ${ABSENT_STEP_LABELS[expected].title.toLowerCase()} — ${absent.name} (${ABSENT_STEP_LABELS[expected].source})`,
      lockoutId: s.id,
      absentUserId: absent.id,
      absentName: absent.name,
      note: input.note,
    };
    if (expected === 'locks-removed') {
      if (s.state === 'released') throw conflict('This lockout was already released');
      const { points, member } = await absentLocks(tx, s.id, absent.id);
      const isPrimary = s.primary.id === absent.id;
      if (isPrimary) {
        const others = await tx.find(LockoutMember, { session: s.id, leftAt: null, user: { $ne: absent.id } }, { populate: ['user'] });
        if (others.length)
          throw conflict(
            `Personal locks are still on this group lockout: ${others.map((m) => `${m.user.getEntity().name} (${m.lockNumber})`).join(', ')}. They remove their own locks first.`,
          );
      }
      const now = takeOffDevices(tx, points, who.userId);
      if (member) member.leftAt = now;
      details.removed = [...points.map((p) => ({ key: p.sourceKey, lock: p.lockNumber })), ...(member ? [{ key: 'personal', lock: member.lockNumber }] : [])];
      const remaining = await tx.count(LockoutPoint, { session: s.id, removedAt: null, id: { $nin: points.map((p) => p.id) } });
      if (isPrimary && remaining === 0) {
        // The lockout must not end under an outside crew's locks (1910.147(f)(2)); throwing here rolls back the removal too.
        await requireNoOutsideLocks(tx, s.id);
        s.state = 'released';
        s.releasedAt = now;
        details.lockoutReleased = true;
        if (s.workOrderId) await markLockoutReleased(tx, s.workOrderId, now);
      }
    }
    const signOff = await appendSignOff(tx, who, {
      meaning: MEANING[expected],
      subjectType: 'absent-lock-removal',
      subjectId: r.id,
      machineId: s.machine.id,
      details,
      note: input.note,
    });
    r.steps = {
      ...r.steps,
      [expected]: { signOffId: signOff.id, signerId: who.userId, signerName: who.name, at: signOff.signedAt.toISOString(), note: input.note },
    };
    r.step = expected;
    recordActivity(tx, who, `safety.absent-removal-${expected}`, { type: 'LockoutSession', id: s.id }, { removal: r.id, signOffId: signOff.id });
    return { id: r.id, step: expected, signOffId: signOff.id };
  });
}

function toRow(r: IAbsentLockRemoval): AbsentRemovalRow {
  return {
    id: r.id,
    sessionId: r.session.id,
    absentUserId: r.absentUser.id,
    absentName: r.absentUser.getEntity().name,
    supervisorName: r.supervisor.getEntity().name,
    step: r.step,
    nextStep: nextStep(r.step),
    locks: r.locks,
    steps: ABSENT_REMOVAL_STEPS.filter((k) => r.steps[k]).map((k) => ({
      step: k,
      signerName: r.steps[k].signerName,
      at: r.steps[k].at,
      note: r.steps[k].note,
      signOffId: r.steps[k].signOffId,
    })),
  };
}

export async function listAbsentRemovals(em: EntityManager, lockoutId: string): Promise<AbsentRemovalRow[]> {
  const rows = await em.find(AbsentLockRemoval, { session: lockoutId }, { populate: ['absentUser', 'supervisor'], orderBy: { createdAt: 'asc' } });
  return rows.map(toRow);
}

/** Someone whose locks were removed while away is told before working again (1910.147(e)(3)(iii)). */
export async function requireInformedOfRemoval(em: EntityManager, userId: string): Promise<void> {
  const pending = await em.findOne(AbsentLockRemoval, { absentUser: userId, step: 'locks-removed' }, { populate: ['session.machine'] });
  if (pending)
    throw forbidden(
      `Your locks on ${pending.session.getEntity().machine.getEntity().code} were removed while you were away; a supervisor must tell you and sign that before you resume work (OSHA 29 CFR 1910.147(e)(3)(iii))`,
    );
}
