import { createHash, randomUUID } from 'node:crypto';
import type { EntityManager } from '@mikro-orm/postgresql';
import { SafetySignOff, type ISafetySignOff } from './sign-off.entity';
import { User } from '../users/user.entity';
import { verifyPassword } from '../auth/passwords';
import { AppError } from '../../http/errors';
import type { Principal } from '../../http/principal';
import { chainHash, verifyChain, GENESIS_HASH } from '../../../shared/domain/signature-chain';
import { MEANING_STATEMENTS, type ChainVerification, type SignMeaning } from '../../../shared/schemas/safety-sign-offs';
import { clock } from '../../../shared/clock';
import { compareWithLastCopy } from './chain-copy';

/** FIPS 180-4 SHA-256 of the UTF-8 bytes, lowercase hex (what signature-chain.ts expects). */
export const sha256Hex = (s: string) => createHash('sha256').update(s, 'utf8').digest('hex');

/**
 * Re-authentication at signing: the signer types their password again. A wrong password is
 * a 401 naming the field, and the caller has written nothing yet.
 */
export async function confirmSignature(em: EntityManager, who: Pick<Principal, 'userId'>, password: string): Promise<void> {
  const user = await em.findOne(User, who.userId, { filters: false });
  if (!(await verifyPassword(user?.passwordHash, password))) {
    throw new AppError(401, 'signature_refused', 'That password is not right, so nothing was signed. Enter your own password to sign.', [
      { path: 'password', message: 'Wrong password: nothing was signed' },
    ]);
  }
}

export type SignInput = {
  meaning: SignMeaning;
  subjectType: string;
  subjectId: string;
  machineId?: string | null;
  /** Facts signed for; `summary` is the one-line text shown in the audit. Must be plain JSON. */
  details: Record<string, unknown> & { summary: string };
  note?: string | null;
  correctsId?: string | null;
};

type StoredFields = {
  id: string;
  organizationId: string;
  seq: number;
  signedAt: Date;
  signerId: string;
  signerName: string;
  signerRole: string;
  meaning: SignMeaning;
  statement: string;
  subjectType: string;
  subjectId: string;
  machineId: string | null;
  details: Record<string, unknown>;
  correctsId: string | null;
  note: string | null;
};

/** Exactly the stored columns that the hash covers; verification rebuilds this from the row. */
export function signOffContent(f: StoredFields) {
  return {
    id: f.id,
    organizationId: f.organizationId,
    seq: f.seq,
    signedAt: f.signedAt,
    signerId: f.signerId,
    signerName: f.signerName,
    signerRole: f.signerRole,
    meaning: f.meaning,
    statement: f.statement,
    subjectType: f.subjectType,
    subjectId: f.subjectId,
    machineId: f.machineId,
    details: f.details,
    correctsId: f.correctsId,
    note: f.note,
  };
}

/**
 * Appends one signature to the shop's chain inside the caller's transaction. The chain-head
 * row is locked (SELECT … FOR UPDATE) for the rest of the transaction, so concurrent
 * signatures of one shop queue up and each links to the one before it. `at` exists only for
 * the demo seed's back-dated history; every real signature takes the server's clock.
 */
export async function appendSignOff(tx: EntityManager, signer: Principal, input: SignInput, at?: Date): Promise<ISafetySignOff> {
  if (!tx.isInTransaction()) throw new Error('appendSignOff must run inside em.transactional');
  const orgId = signer.orgId;
  await tx.execute(
    `insert into safety_chain_head (id, organization_id, last_seq, last_hash, updated_at) values (?, ?, 0, ?, now()) on conflict (organization_id) do nothing`,
    [randomUUID(), orgId, GENESIS_HASH],
  );
  const [head] = await tx.execute<{ last_seq: number; last_hash: string }[]>(
    `select last_seq, last_hash from safety_chain_head where organization_id = ? for update`,
    [orgId],
  );
  // JSON round trip: what is hashed is exactly what jsonb will give back (no undefined, no class instances).
  const details = JSON.parse(JSON.stringify(input.details)) as Record<string, unknown>;
  const fields: StoredFields = {
    id: randomUUID(),
    organizationId: orgId,
    seq: Number(head.last_seq) + 1,
    signedAt: at ?? clock.now(),
    signerId: signer.userId,
    signerName: signer.name,
    signerRole: signer.role,
    meaning: input.meaning,
    statement: MEANING_STATEMENTS[input.meaning],
    subjectType: input.subjectType,
    subjectId: input.subjectId,
    machineId: input.machineId ?? null,
    details,
    correctsId: input.correctsId ?? null,
    note: input.note ?? null,
  };
  const hash = chainHash(head.last_hash, signOffContent(fields), sha256Hex);
  const row = tx.create(SafetySignOff, {
    id: fields.id,
    organization: orgId,
    seq: fields.seq,
    signedAt: fields.signedAt,
    signer: fields.signerId,
    signerName: fields.signerName,
    signerRole: fields.signerRole,
    meaning: fields.meaning,
    statement: fields.statement,
    subjectType: fields.subjectType,
    subjectId: fields.subjectId,
    machine: fields.machineId,
    details,
    corrects: fields.correctsId,
    note: fields.note,
    prevHash: head.last_hash,
    hash,
  });
  await tx.execute(`update safety_chain_head set last_seq = ?, last_hash = ?, updated_at = now() where organization_id = ?`, [fields.seq, hash, orgId]);
  return row;
}

type Row = {
  id: string;
  organization_id: string;
  seq: number;
  signed_at: Date;
  signer_id: string;
  signer_name: string;
  signer_role: string;
  meaning: SignMeaning;
  statement: string;
  subject_type: string;
  subject_id: string;
  machine_id: string | null;
  details: Record<string, unknown>;
  corrects_id: string | null;
  note: string | null;
  prev_hash: string;
  hash: string;
};

/**
 * Recomputes the shop's whole chain from the stored rows and compares its end with the chain
 * head: an altered row, a removed row and removed newest rows all show, with the first bad one.
 */
export async function verifyShopChain(em: EntityManager, orgId: string): Promise<ChainVerification> {
  const rows = await em.getConnection().execute<Row[]>(`select * from safety_sign_off where organization_id = ? order by seq`, [orgId]);
  const [head] = await em
    .getConnection()
    .execute<{ last_seq: number; last_hash: string }[]>(`select last_seq, last_hash from safety_chain_head where organization_id = ?`, [orgId]);
  const records = rows.map((r) => ({
    id: r.id,
    prevHash: r.prev_hash,
    hash: r.hash,
    content: signOffContent({
      id: r.id,
      organizationId: r.organization_id,
      seq: Number(r.seq),
      signedAt: new Date(r.signed_at),
      signerId: r.signer_id,
      signerName: r.signer_name,
      signerRole: r.signer_role,
      meaning: r.meaning,
      statement: r.statement,
      subjectType: r.subject_type,
      subjectId: r.subject_id,
      machineId: r.machine_id,
      details: r.details,
      correctsId: r.corrects_id,
      note: r.note,
    }),
  }));
  const result = verifyChain(records, sha256Hex);
  const headSeq = head ? Number(head.last_seq) : 0;
  const base = { total: rows.length, headSeq, verifiedAt: clock.now().toISOString() };
  const describe = (r: Row | undefined, seq: number) =>
    r
      ? { id: r.id, seq: Number(r.seq), signedAt: new Date(r.signed_at).toISOString(), signerName: r.signer_name, meaning: r.meaning }
      : { id: null, seq, signedAt: null, signerName: null, meaning: null };
  if (!result.ok) {
    const bad = rows[result.count];
    const what =
      result.problem === 'content-altered'
        ? `record #${bad.seq} (${bad.signer_name}, ${new Date(bad.signed_at).toISOString()}) was changed after signing`
        : `the link before record #${bad.seq} is broken: a record before it was removed, reordered or rewritten`;
    return { ...base, ok: false, checked: result.count, problem: result.problem, message: `Chain broken: ${what}.`, firstBad: describe(bad, Number(bad.seq)) };
  }
  const last = rows[rows.length - 1];
  const lastHash = last ? last.hash : GENESIS_HASH;
  if (!head ? rows.length > 0 : Number(head.last_seq) !== rows.length || head.last_hash !== lastHash) {
    const missingFrom = rows.length + 1;
    return {
      ...base,
      ok: false,
      checked: rows.length,
      problem: 'head-mismatch',
      message: `Chain broken: the chain head expects ${headSeq} records but ${rows.length} are stored; the newest records (from #${missingFrom}) were removed or the head was changed.`,
      firstBad: describe(undefined, missingFrom),
    };
  }
  // Self-consistent is not enough: a history rewritten with its hashes and head recomputed
  // shows against the newest copy of the head that left the database.
  const copy = await compareWithLastCopy(em, orgId);
  if (!copy.ok) {
    return {
      ...base,
      ok: false,
      checked: rows.length,
      problem: 'copy-mismatch',
      message: copy.message,
      firstBad: describe(rows[copy.seq - 1], copy.seq),
      lastCopy: null,
    };
  }
  return {
    ...base,
    ok: true,
    checked: rows.length,
    problem: null,
    message: `Chain verified: all ${rows.length} signatures are intact and in order${copy.copy ? `, and record #${copy.copy.seq} still matches the copy of ${copy.copy.madeAt}` : ''}.`,
    firstBad: null,
    lastCopy: copy.copy,
  };
}
