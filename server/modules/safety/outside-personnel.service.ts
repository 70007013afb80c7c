/**
 * Outside personnel on a lockout, OSHA 29 CFR 1910.147(f)(2). Each step is signed into the chain
 * by an on-site authorized employee: (i) procedures exchanged, then the outside lead's
 * acknowledgement of ours (they have no account: the on-site person types what the lead said and
 * signs as witness), (ii) our affected employees told of the outside restrictions, and the outside
 * locks on and off, which count in the lock register and in "a lock cannot be in two places".
 */
import type { EntityManager } from '@mikro-orm/postgresql';
import { LockoutSession } from './lockout.entity';
import { OutsideParty, type IOutsideParty } from './outside-party.entity';
import { appendSignOff } from './chain';
import { locksInUse } from './lockout.service';
import { badRequest, conflict, notFound } from '../../http/errors';
import { recordActivity } from '../activity-log/activity-log.service';
import type { Principal } from '../../http/principal';
import {
  OUTSIDE_STEP_LABELS,
  OUTSIDE_STEPS,
  type AcknowledgeOutsideInput,
  type InformOutsideInput,
  type OutsidePartyRow,
  type OutsideStep,
  type RegisterOutsidePartyInput,
  type OutsideLocksRemovedInput,
} from '../../../shared/schemas/safety-outside-personnel';
import type { SignMeaning } from '../../../shared/schemas/safety-sign-offs';
import { clock } from '../../../shared/clock';

const SUBJECT = 'outside-party';
const MEANING: Record<OutsideStep, SignMeaning> = {
  'procedures-exchanged': 'outside-procedures-exchanged',
  'lead-acknowledged': 'outside-procedure-acknowledged',
  'restrictions-informed': 'outside-restrictions-informed',
  'locks-applied': 'outside-locks-applied',
  'locks-removed': 'outside-locks-removed',
};

type Fields = { path: string; message: string }[];
const refuseIf = (fields: Fields, message: string) => {
  if (fields.length) throw badRequest(message, fields);
};

async function openSession(tx: EntityManager, orgId: string, id: string) {
  // Row lock: a release and an outside step on one lockout are applied one after the other.
  await tx.execute('select id from safety_lockout where id = ? and organization_id = ? for update', [id, orgId]);
  const s = await tx.findOne(LockoutSession, id, { populate: ['machine'] });
  if (!s) throw notFound('Lockout');
  if (s.state === 'released') throw conflict('This lockout was already released');
  return s;
}

async function sign(
  tx: EntityManager,
  who: Principal,
  party: IOutsideParty,
  step: OutsideStep,
  machine: { id: string; code: string },
  details: Record<string, unknown>,
) {
  const signOff = await appendSignOff(tx, who, {
    meaning: MEANING[step],
    subjectType: SUBJECT,
    subjectId: party.id,
    machineId: machine.id,
    details: {
      summary: `${machine.code}: ${party.company} — ${OUTSIDE_STEP_LABELS[step].title.toLowerCase()} (${OUTSIDE_STEP_LABELS[step].source})`,
      lockoutId: party.session.id,
      company: party.company,
      leadName: party.leadName,
      ...details,
    },
  });
  party.steps = { ...party.steps, [step]: { signOffId: signOff.id, signerId: who.userId, signerName: who.name, at: signOff.signedAt.toISOString() } };
  recordActivity(tx, who, `safety.outside-${step}`, { type: 'LockoutSession', id: party.session.id }, { party: party.id, signOffId: signOff.id });
  return signOff;
}

/** Step (i), 1910.147(f)(2)(i): their procedure received and reviewed, ours given; the crew and its locks are named. */
export async function registerOutsideParty(em: EntityManager, who: Principal, lockoutId: string, input: RegisterOutsidePartyInput) {
  return em.transactional(async (tx) => {
    const s = await openSession(tx, who.orgId, lockoutId);
    refuseIf(
      [
        ...(input.theirProcedureReviewed ? [] : [{ path: 'theirProcedureReviewed', message: 'Receive and review their energy-control procedure first' }]),
        ...(input.ourProcedureGiven ? [] : [{ path: 'ourProcedureGiven', message: 'Give them our energy-control procedure for this machine' }]),
      ],
      'The on-site and the outside employer inform each other of their energy-control procedures before outside work starts (OSHA 29 CFR 1910.147(f)(2)(i))',
    );
    const machine = s.machine.getEntity();
    const party = tx.create(OutsideParty, {
      organization: who.orgId,
      session: s,
      company: input.company,
      leadName: input.leadName,
      leadContact: input.leadContact,
      procedureTitle: input.procedureTitle,
      procedureVersion: input.procedureVersion,
      lockNumbers: input.lockNumbers,
      registeredBy: who.userId,
      steps: {},
    });
    const signOff = await sign(tx, who, party, 'procedures-exchanged', machine, {
      leadContact: input.leadContact,
      theirProcedure: { title: input.procedureTitle, version: input.procedureVersion },
      ourProcedureId: s.procedure.id,
      lockNumbers: input.lockNumbers,
    });
    return { id: party.id, signOffId: signOff.id };
  });
}

async function loadParty(tx: EntityManager, who: Principal, id: string) {
  const party = await tx.findOne(OutsideParty, id);
  if (!party) throw notFound('Outside party');
  const s = await openSession(tx, who.orgId, party.session.id);
  await tx.refresh(party);
  return { party, s, machine: s.machine.getEntity() };
}

/** The lead acknowledges our procedure in their own words, witnessed by the on-site person who signs. */
export async function acknowledgeOutside(em: EntityManager, who: Principal, id: string, input: AcknowledgeOutsideInput) {
  return em.transactional(async (tx) => {
    const { party, machine } = await loadParty(tx, who, id);
    if (party.steps['lead-acknowledged']) throw conflict(`${party.leadName} already acknowledged our procedure`);
    const fields: Fields = [];
    if (input.leadNameTyped.toLowerCase() !== party.leadName.toLowerCase())
      fields.push({ path: 'leadNameTyped', message: `Type the lead’s name as registered (${party.leadName}) to show who acknowledged` });
    if (input.acknowledgement.length < 10)
      fields.push({ path: 'acknowledgement', message: 'Write down what the lead said, in their words (at least 10 characters)' });
    refuseIf(fields, `${party.leadName} must acknowledge our energy-control procedure before their people work under it (OSHA 29 CFR 1910.147(f)(2)(i))`);
    party.acknowledgement = input.acknowledgement;
    const signOff = await sign(tx, who, party, 'lead-acknowledged', machine, { acknowledgedBy: party.leadName, acknowledgement: input.acknowledgement });
    return { id: party.id, signOffId: signOff.id };
  });
}

/** 1910.147(f)(2)(ii): our affected employees are told of the outside employer's restrictions. */
export async function informOfRestrictions(em: EntityManager, who: Principal, id: string, input: InformOutsideInput) {
  return em.transactional(async (tx) => {
    const { party, machine } = await loadParty(tx, who, id);
    if (party.steps['restrictions-informed']) throw conflict('Our affected employees were already told of these restrictions');
    const fields: Fields = [];
    if (input.restrictions.length < 5) fields.push({ path: 'restrictions', message: 'Write down the outside employer’s restrictions our people must keep' });
    if (input.informedWho.length < 3) fields.push({ path: 'informedWho', message: 'Name the affected employees you told' });
    refuseIf(fields, 'Our affected employees must understand and comply with the outside employer’s restrictions (OSHA 29 CFR 1910.147(f)(2)(ii))');
    party.restrictions = input.restrictions;
    party.informedWho = input.informedWho;
    const signOff = await sign(tx, who, party, 'restrictions-informed', machine, { restrictions: input.restrictions, informedWho: input.informedWho });
    return { id: party.id, signOffId: signOff.id };
  });
}

/** Their locks go on only after their lead acknowledged our procedure and our people were told of their restrictions. */
export async function applyOutsideLocks(em: EntityManager, who: Principal, id: string) {
  return em.transactional(async (tx) => {
    const { party, machine } = await loadParty(tx, who, id);
    if (party.locksAppliedAt) throw conflict(`${party.company}'s locks are already on this lockout`);
    const missing: Fields = [];
    if (!party.steps['lead-acknowledged']) missing.push({ path: 'acknowledgement', message: `${party.leadName} has not acknowledged our procedure yet` });
    if (!party.steps['restrictions-informed'])
      missing.push({ path: 'restrictionsInformed', message: 'Our affected employees have not been told of their restrictions yet' });
    if (missing.length)
      throw conflict(`Before ${party.company}'s locks go on: ${missing.map((m) => m.message).join('; ')} (OSHA 29 CFR 1910.147(f)(2))`, missing);
    const used = await locksInUse(tx, who.orgId, party.lockNumbers);
    const clashes = party.lockNumbers.flatMap((n, i) => {
      const where = used.get(n.toUpperCase());
      return where ? [{ path: `lockNumbers.${i}`, message: `Lock ${n} is already on ${where}` }] : [];
    });
    if (clashes.length) throw conflict(clashes.map((c) => c.message).join('; '), clashes);
    party.locksAppliedAt = clock.now();
    const signOff = await sign(tx, who, party, 'locks-applied', machine, { locks: party.lockNumbers });
    party.locksAppliedAt = signOff.signedAt;
    return { id: party.id, signOffId: signOff.id };
  });
}

/** Their lead takes off their own locks, the on-site person witnesses it and that their people are clear. */
export async function removeOutsideLocks(em: EntityManager, who: Principal, id: string, input: OutsideLocksRemovedInput) {
  return em.transactional(async (tx) => {
    const { party, machine } = await loadParty(tx, who, id);
    if (!party.locksAppliedAt) throw conflict(`${party.company}'s locks are not on this lockout`, [{ path: 'locks', message: 'Not on' }]);
    if (party.locksRemovedAt) throw conflict(`${party.company}'s locks were already removed`);
    refuseIf(
      [
        ...(input.removedByTheirLead ? [] : [{ path: 'removedByTheirLead', message: `${party.leadName} (or each of their people) removes their own locks` }]),
        ...(input.peopleClear ? [] : [{ path: 'peopleClear', message: `Check that ${party.company}'s people are clear of the machine` }]),
      ],
      'Each lock is removed by the person who applied it (OSHA 29 CFR 1910.147(e)(3))',
    );
    const signOff = await sign(tx, who, party, 'locks-removed', machine, { locks: party.lockNumbers, peopleClear: true });
    party.locksRemovedAt = signOff.signedAt;
    return { id: party.id, signOffId: signOff.id };
  });
}

function toRow(p: IOutsideParty): OutsidePartyRow {
  const done = OUTSIDE_STEPS.filter((k) => p.steps[k]);
  const open = OUTSIDE_STEPS.filter((k) => !p.steps[k]);
  return {
    id: p.id,
    lockoutId: p.session.id,
    company: p.company,
    leadName: p.leadName,
    leadContact: p.leadContact,
    procedureTitle: p.procedureTitle,
    procedureVersion: p.procedureVersion,
    lockNumbers: p.lockNumbers,
    registeredByName: p.registeredBy.getEntity().name,
    acknowledgement: p.acknowledgement ?? null,
    restrictions: p.restrictions ?? null,
    informedWho: p.informedWho ?? null,
    locksOn: !!p.locksAppliedAt && !p.locksRemovedAt,
    steps: done.map((k) => ({ step: k, signerName: p.steps[k].signerName, at: p.steps[k].at, signOffId: p.steps[k].signOffId })),
    open,
  };
}

/** Where a refused step belongs in the safety audit: the party, on its lockout's machine. */
export async function outsidePartyContext(em: EntityManager, id: string): Promise<{ subjectId: string; lockoutId?: string }> {
  const party = await em.findOne(OutsideParty, id);
  return { subjectId: id, lockoutId: party?.session.id };
}

export async function listOutsideParties(em: EntityManager, lockoutId: string): Promise<OutsidePartyRow[]> {
  const rows = await em.find(OutsideParty, { session: lockoutId }, { populate: ['registeredBy'], orderBy: { createdAt: 'asc' } });
  return rows.map(toRow);
}
