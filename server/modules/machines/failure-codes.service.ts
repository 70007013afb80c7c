/** The shop's failure-mode, cause and remedy codes: started from Kerfbook's lists on first use, then edited by the shop. */
import { randomUUID } from 'node:crypto';
import type { EntityManager } from '@mikro-orm/postgresql';
import { FailureCode, MachineDowntime } from './machine-state.entity';
import type { Principal } from '../../http/principal';
import { conflict, fieldError, notFound } from '../../http/errors';
import { recordActivity } from '../activity-log/activity-log.service';
import { clock } from '../../../shared/clock';
import {
  FAILURE_CODE_CATEGORIES,
  FAILURE_CODE_CATEGORY_LABELS,
  STARTER_FAILURE_CODES,
  type DowntimeCodesInput,
  type FailureCodeCategory,
  type FailureCodeInput,
  type FailureCodeRow,
  type FailureCodeUpdate,
} from '../../../shared/schemas/failure-codes';

/**
 * Gives a shop the starter lists once (a shop that has any code keeps what it has). Concurrent
 * first reads insert the same keys; the unique key lets only one through.
 */
async function ensureStarterCodes(em: EntityManager, orgId: string): Promise<void> {
  const [{ n }]: { n: string }[] = await em.execute('select count(*) as n from failure_code where organization_id = ?', [orgId]);
  if (Number(n) > 0) return;
  const now = clock.now();
  const rows = FAILURE_CODE_CATEGORIES.flatMap((category) =>
    STARTER_FAILURE_CODES[category].map((c) => ({ id: randomUUID(), category, code: c.code, label: c.label })),
  );
  await em.execute(
    `insert into failure_code (id, created_at, updated_at, organization_id, category, code, label, active)
     select x.id, ?, ?, ?, x.category, x.code, x.label, true
       from jsonb_to_recordset(?::jsonb) as x(id uuid, category text, code text, label text)
     on conflict (organization_id, category, code) do nothing`,
    [now, now, orgId, JSON.stringify(rows)],
  );
}

const toRow = (c: { id: string; category: FailureCodeCategory; code: string; label: string; active: boolean }): FailureCodeRow => ({
  id: c.id,
  category: c.category,
  code: c.code,
  label: c.label,
  active: c.active,
});

export async function listFailureCodes(em: EntityManager, who: Principal): Promise<FailureCodeRow[]> {
  await ensureStarterCodes(em, who.orgId);
  const codes = await em.find(FailureCode, {}, { orderBy: { category: 'asc', code: 'asc' } });
  return codes.map(toRow);
}

export async function createFailureCode(em: EntityManager, who: Principal, input: FailureCodeInput): Promise<FailureCodeRow> {
  return em.transactional(async (tx) => {
    await ensureStarterCodes(tx, who.orgId);
    const taken = await tx.findOne(FailureCode, { category: input.category, code: input.code });
    if (taken) throw conflict(`${input.code} is already a ${input.category} code`, [{ path: 'code', message: `${input.code} is taken` }]);
    const c = tx.create(FailureCode, { organization: who.orgId, category: input.category, code: input.code, label: input.label, active: true });
    recordActivity(tx, who, 'failure-code.created', { type: 'FailureCode', id: c.id }, { category: c.category, code: c.code, label: c.label });
    return toRow(c);
  });
}

export async function updateFailureCode(em: EntityManager, who: Principal, id: string, input: FailureCodeUpdate): Promise<FailureCodeRow> {
  return em.transactional(async (tx) => {
    const c = await tx.findOne(FailureCode, { id });
    if (!c) throw notFound('Failure code');
    const before = { label: c.label, active: c.active };
    if (input.label !== undefined) c.label = input.label;
    if (input.active !== undefined) c.active = input.active;
    recordActivity(tx, who, 'failure-code.updated', { type: 'FailureCode', id: c.id }, { code: c.code, before, after: { label: c.label, active: c.active } });
    return toRow(c);
  });
}

/** Refuses a code the shop does not have (or has retired), naming the field. */
export async function assertShopCode(em: EntityManager, orgId: string, category: FailureCodeCategory, code: string, field: string): Promise<void> {
  await ensureStarterCodes(em, orgId);
  const c = await em.findOne(FailureCode, { category, code, active: true });
  if (!c) throw fieldError(field, `${code} is not one of the shop's ${FAILURE_CODE_CATEGORY_LABELS[category].toLowerCase()} codes`);
}

/** Sets the failure, cause and remedy codes of a stop once they are known. */
export async function setDowntimeCodes(em: EntityManager, who: Principal, id: string, input: DowntimeCodesInput): Promise<void> {
  await em.transactional(async (tx) => {
    const d = await tx.findOne(MachineDowntime, { id });
    if (!d) throw notFound('Downtime');
    if (input.failureCode) await assertShopCode(tx, who.orgId, 'mode', input.failureCode, 'failureCode');
    if (input.causeCode) await assertShopCode(tx, who.orgId, 'cause', input.causeCode, 'causeCode');
    if (input.remedyCode) await assertShopCode(tx, who.orgId, 'remedy', input.remedyCode, 'remedyCode');
    const before = { failureCode: d.failureCode, causeCode: d.causeCode, remedyCode: d.remedyCode };
    if (input.failureCode !== undefined) d.failureCode = input.failureCode;
    if (input.causeCode !== undefined) d.causeCode = input.causeCode;
    if (input.remedyCode !== undefined) d.remedyCode = input.remedyCode;
    recordActivity(
      tx,
      who,
      'machine.downtime-coded',
      { type: 'Machine', id: d.machine.id },
      { downtimeId: d.id, before, after: { failureCode: d.failureCode, causeCode: d.causeCode, remedyCode: d.remedyCode } },
    );
  });
}
