// Copies of the sign-off chain head outside the database (the daily mail to the safety officers
// and the download from the safety audit) catch a history rewritten by someone who owns the
// tables and recomputed every hash and the head, which the chain alone cannot.
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import type pg from 'pg';
import type { MikroORM } from '@mikro-orm/postgresql';
import { makeTestApp } from '../setup/test-app';
import { approvedProcedure, cellProcedure, get, makeSafetyShop, ownerRole, PASSWORD, post, type SafetyShop } from './safety-helpers';
import { drainOutbox, pendingMails } from './work-orders-fixtures';
import { chainHash, verifyChain } from '../../shared/domain/signature-chain';
import { sha256Hex, signOffContent } from '../../server/modules/safety/chain';
import { runScheduledPass } from '../../server/jobs/scheduler';
import { initORM } from '../../server/db';
import { clock } from '../../shared/clock';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let orm: MikroORM;
beforeAll(async () => {
  t = await makeTestApp();
  orm = await initORM();
});
afterAll(async () => {
  await orm.close(true);
  await t.close();
});

type Row = Record<string, unknown> & { id: string; seq: number; prev_hash: string; hash: string };
const contentOf = (r: Row) =>
  signOffContent({
    id: r.id,
    organizationId: r.organization_id as string,
    seq: Number(r.seq),
    signedAt: new Date(r.signed_at as string),
    signerId: r.signer_id as string,
    signerName: r.signer_name as string,
    signerRole: r.signer_role as string,
    meaning: r.meaning as never,
    statement: r.statement as string,
    subjectType: r.subject_type as string,
    subjectId: r.subject_id as string,
    machineId: r.machine_id as string | null,
    details: r.details as Record<string, unknown>,
    correctsId: r.corrects_id as string | null,
    note: r.note as string | null,
  });

/**
 * As the table owner (not the app role, which has no UPDATE on the table): switch the
 * append-only trigger off, change `change` on the rows, recompute every hash from `fromSeq`
 * on and the head, switch the trigger back on. What remains is a chain that verifies on its own.
 */
async function rewriteHistory(orgId: string, fromSeq: number, change: (o: pg.Client) => Promise<void>) {
  const o = await ownerRole();
  try {
    await o.query('begin');
    await o.query('alter table safety_sign_off disable trigger safety_sign_off_no_change');
    await change(o);
    const rows: Row[] = (await o.query('select * from safety_sign_off where organization_id = $1 order by seq', [orgId])).rows;
    let prev = fromSeq > 1 ? (rows[fromSeq - 2] ?? rows.at(-1)!).hash : rows[0].prev_hash;
    for (const r of rows.filter((x) => Number(x.seq) >= fromSeq)) {
      const hash = chainHash(prev, contentOf(r), sha256Hex);
      await o.query('update safety_sign_off set prev_hash = $1, hash = $2 where id = $3', [prev, hash, r.id]);
      prev = hash;
    }
    const last = rows.at(-1)!;
    await o.query('update safety_chain_head set last_seq = $1, last_hash = $2 where organization_id = $3', [Number(last.seq), prev, orgId]);
    await o.query('alter table safety_sign_off enable trigger safety_sign_off_no_change');
    await o.query('commit');
  } finally {
    await o.end();
  }
}

/** The chain checked on its own (links and hashes only), as verification did before copies. */
async function chainAloneVerifies(orgId: string): Promise<boolean> {
  const o = await ownerRole();
  try {
    const rows: Row[] = (await o.query('select * from safety_sign_off where organization_id = $1 order by seq', [orgId])).rows;
    return verifyChain(
      rows.map((r) => ({ id: r.id, prevHash: r.prev_hash, hash: r.hash, content: contentOf(r) })),
      sha256Hex,
    ).ok;
  } finally {
    await o.end();
  }
}

async function shopWithSignatures(label: string, checks: number): Promise<SafetyShop> {
  const shop = await makeSafetyShop(t.app, t.em(), label);
  await approvedProcedure(shop, cellProcedure(), shop.machineId, []);
  const req = await post(shop.s.safety, '/safety/ppe/requirements', {
    machineId: shop.machineId,
    task: 'Punching',
    items: ['safety-glasses'],
    otherItems: [],
    arcCurrentA: null,
    noise: [],
    cadence: 'shift',
  }).expect(201);
  for (let i = 0; i < checks; i++)
    await post(shop.s.operator, '/safety/ppe/checks', { requirementId: req.body.id, confirmed: ['safety-glasses'], password: PASSWORD }).expect(201);
  return shop;
}

describe('copies of the chain head outside the database', () => {
  it('mails the signed head to the safety officer once a day; verify then catches history the owner rewrote with recomputed hashes', async () => {
    const shop = await shopWithSignatures('copy-mail', 3); // approval + 3 checks: head #4
    await drainOutbox(orm);
    await runScheduledPass(orm, clock.now(), { orgId: shop.orgId });
    await runScheduledPass(orm, clock.now(), { orgId: shop.orgId });
    const mails = (await pendingMails(orm, shop.orgId)).filter((m) => m.kind === 'safety-chain-copy');
    expect(mails.map((m) => m.toAddress)).toEqual([shop.users.safety.email]);
    expect(mails[0].subject).toMatch(/: record #4$/);
    const mailed = JSON.parse(mails[0].textBody.split('\n').find((l) => l.startsWith('{"format":"kerfbook-chain-head/1"'))!);
    expect(mailed).toMatchObject({ shopId: shop.orgId, seq: 4, via: 'mail', signature: expect.stringMatching(/^[0-9a-f]{64}$/) });
    const headNow = await get(shop.s.safety, '/safety/chain/verify').expect(200);
    expect(headNow.body).toMatchObject({ ok: true, headSeq: 4, lastCopy: { seq: 4, hash: mailed.hash, via: 'mail' } });
    expect((await post(shop.s.safety, '/safety/chain/copies/check', mailed).expect(200)).body).toMatchObject({ signatureValid: true, matches: true });

    // The owner changes who signed record #2 and recomputes #2–#4 and the head.
    await rewriteHistory(shop.orgId, 2, async (o) => {
      await o.query(`update safety_sign_off set signer_name = 'Someone Else' where organization_id = $1 and seq = 2`, [shop.orgId]);
    });
    expect(await chainAloneVerifies(shop.orgId)).toBe(true);
    const v = await get(shop.s.safety, '/safety/chain/verify').expect(200);
    expect(v.body).toMatchObject({ ok: false, problem: 'copy-mismatch', total: 4, headSeq: 4, firstBad: { seq: 4 } });
    expect(v.body.message).toMatch(/record #4 now has hash [0-9a-f]{12}…, not the one in the chain head mailed to the safety officers .* rewritten/);
    // The kept mail says the same, and its signature still holds.
    const kept = await post(shop.s.safety, '/safety/chain/copies/check', mailed).expect(200);
    expect(kept.body).toMatchObject({ signatureValid: true, matches: false, message: expect.stringMatching(/rewritten/) });
  });

  it('downloads a signed head for the audit; a forged copy fails its signature; truncated history shows against the download', async () => {
    const shop = await shopWithSignatures('copy-export', 2); // head #3
    await post(shop.s.operator, '/safety/chain/copies').expect(403);
    const copy = (await post(shop.s.safety, '/safety/chain/copies').expect(201)).body;
    expect(copy).toMatchObject({ format: 'kerfbook-chain-head/1', seq: 3, via: 'export', shopId: shop.orgId });

    // A made-up copy (another hash under the same signature, or a signature someone computed without the secret) does not check out.
    const forged = await post(shop.s.safety, '/safety/chain/copies/check', { ...copy, hash: 'a'.repeat(64) }).expect(200);
    expect(forged.body).toMatchObject({ signatureValid: false, matches: false });
    expect((await post(shop.s.safety, '/safety/chain/copies/check', { ...copy, signature: sha256Hex(copy.hash) }).expect(200)).body.signatureValid).toBe(false);
    await post(shop.s.safety, '/safety/chain/copies/check', { ...copy, seq: 'x' }).expect(400);

    // The newest record removed and the head set back to #2: the rows chain and match the head.
    await rewriteHistory(shop.orgId, Number.MAX_SAFE_INTEGER, async (o) => {
      await o.query('delete from safety_ppe_check where sign_off_id in (select id from safety_sign_off where organization_id = $1 and seq = 3)', [shop.orgId]);
      await o.query('delete from safety_sign_off where organization_id = $1 and seq = 3', [shop.orgId]);
    });
    expect(await chainAloneVerifies(shop.orgId)).toBe(true);
    const v = await get(shop.s.safety, '/safety/chain/verify').expect(200);
    expect(v.body).toMatchObject({ ok: false, problem: 'copy-mismatch', total: 2, headSeq: 2 });
    expect(v.body.message).toMatch(/the chain head downloaded at .* \(record #3, .* is no longer in the database/);
  });
});
