import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { makeTestApp } from '../setup/test-app';
import {
  appRole,
  approvedProcedure,
  cellProcedure,
  countSignOffs,
  get,
  makeSafetyShop,
  ownerRole,
  PASSWORD,
  post,
  superuser,
  type SafetyShop,
} from './safety-helpers';
import { GENESIS_HASH, chainHash } from '../../shared/domain/signature-chain';
import { sha256Hex, signOffContent } from '../../server/modules/safety/chain';

let t: Awaited<ReturnType<typeof makeTestApp>>;
beforeAll(async () => {
  t = await makeTestApp();
});
afterAll(() => t.close());

/** A shop with a PPE requirement, so that operators can add signatures quickly. */
async function shopWithPpe(label: string): Promise<SafetyShop & { reqId: string }> {
  const shop = await makeSafetyShop(t.app, t.em(), label);
  const req = await post(shop.s.safety, '/safety/ppe/requirements', {
    machineId: shop.machineId,
    task: 'Punching',
    items: ['safety-glasses', 'safety-footwear'],
    otherItems: [],
    arcCurrentA: null,
    noise: [],
    cadence: 'shift',
  }).expect(201);
  return { ...shop, reqId: req.body.id };
}
const ppeCheck = (shop: SafetyShop & { reqId: string }, who = shop.s.operator) =>
  post(who, '/safety/ppe/checks', { requirementId: shop.reqId, confirmed: ['safety-glasses', 'safety-footwear'], password: PASSWORD });

describe('sign-off chain', () => {
  it('links each signature to the one before it and verifies', async () => {
    const shop = await shopWithPpe('chain-ok');
    await approvedProcedure(shop, cellProcedure(), shop.machineId, []);
    for (let i = 0; i < 3; i++) await ppeCheck(shop).expect(201);
    const c = await appRole();
    const rows = (await c.query('select * from safety_sign_off where organization_id = $1 order by seq', [shop.orgId])).rows;
    await c.end();
    expect(rows.map((r) => r.seq)).toEqual([1, 2, 3, 4]);
    expect(rows[0].prev_hash).toBe(GENESIS_HASH);
    for (let i = 1; i < rows.length; i++) expect(rows[i].prev_hash).toBe(rows[i - 1].hash);
    // The stored hash is SHA-256 over (prevHash, canonical content) (signature-chain.ts chainHash).
    const r = rows[1];
    const content = signOffContent({
      id: r.id,
      organizationId: r.organization_id,
      seq: r.seq,
      signedAt: r.signed_at,
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
    });
    expect(chainHash(r.prev_hash, content, sha256Hex)).toBe(r.hash);
    expect(rows[1].signer_name).toBe(`operator of ${shop.slug}`);
    expect(rows[1].meaning).toBe('ppe-check-done');
    const v = await get(shop.s.safety, '/safety/chain/verify').expect(200);
    expect(v.body).toMatchObject({ ok: true, total: 4, checked: 4, headSeq: 4, problem: null });
    expect(v.body.message).toMatch(/Chain verified/);
  });

  it('refuses a raw UPDATE, DELETE and TRUNCATE by the application role (no privilege) and by the owner (trigger)', async () => {
    const shop = await shopWithPpe('chain-trigger');
    await ppeCheck(shop).expect(201);
    const c = await appRole();
    try {
      const who = (await c.query('select current_user as u, (select rolsuper from pg_roles where rolname = current_user) as s')).rows[0];
      expect(who).toEqual({ u: 'kerfbook', s: false });
      await expect(c.query(`update safety_sign_off set signer_name = 'Someone Else' where organization_id = $1`, [shop.orgId])).rejects.toThrow(
        /permission denied for table safety_sign_off/,
      );
      await expect(c.query('delete from safety_sign_off where organization_id = $1', [shop.orgId])).rejects.toThrow(
        /permission denied for table safety_sign_off/,
      );
      await expect(c.query('truncate safety_sign_off cascade')).rejects.toThrow(/permission denied for table safety_sign_off/);
    } finally {
      await c.end();
    }
    // The owner has every privilege, so the append-only trigger is what stops it.
    const o = await ownerRole();
    try {
      const who = (await o.query('select current_user as u, (select rolsuper from pg_roles where rolname = current_user) as s')).rows[0];
      expect(who).toEqual({ u: 'kerfbook_owner', s: false });
      await expect(o.query(`update safety_sign_off set signer_name = 'Someone Else' where organization_id = $1`, [shop.orgId])).rejects.toThrow(
        /append-only: UPDATE/,
      );
      await expect(o.query('delete from safety_sign_off where organization_id = $1', [shop.orgId])).rejects.toThrow(/append-only: DELETE/);
      await expect(o.query('truncate safety_sign_off cascade')).rejects.toThrow(/append-only: TRUNCATE/);
      const still = (await o.query('select signer_name from safety_sign_off where organization_id = $1', [shop.orgId])).rows;
      expect(still).toEqual([{ signer_name: `operator of ${shop.slug}` }]);
    } finally {
      await o.end();
    }
  });

  it('finds a record altered behind the trigger’s back', async () => {
    const shop = await shopWithPpe('chain-alter');
    for (let i = 0; i < 5; i++) await ppeCheck(shop).expect(201);
    const su = await superuser();
    try {
      // As the superuser, with triggers off for this session only (session_replication_role).
      await su.query('begin');
      await su.query('set local session_replication_role = replica');
      await su.query(`update safety_sign_off set signer_name = 'Someone Else' where organization_id = $1 and seq = 3`, [shop.orgId]);
      await su.query('commit');
    } finally {
      await su.end();
    }
    const v = await get(shop.s.safety, '/safety/chain/verify').expect(200);
    expect(v.body).toMatchObject({ ok: false, problem: 'content-altered', checked: 2, total: 5 });
    expect(v.body.firstBad).toMatchObject({ seq: 3, signerName: 'Someone Else', meaning: 'ppe-check-done' });
    expect(v.body.message).toMatch(/record #3 .* was changed after signing/);
  });

  it('finds a record deleted from the middle, and the newest records removed', async () => {
    const shop = await shopWithPpe('chain-delete');
    for (let i = 0; i < 5; i++) await ppeCheck(shop).expect(201);
    const su = await superuser();
    try {
      await su.query('begin');
      await su.query('set local session_replication_role = replica');
      // ppe_check rows point at their sign-offs; the attacker removes those links too.
      await su.query('delete from safety_ppe_check where sign_off_id in (select id from safety_sign_off where organization_id = $1 and seq in (2, 5))', [
        shop.orgId,
      ]);
      await su.query('delete from safety_sign_off where organization_id = $1 and seq = 2', [shop.orgId]);
      await su.query('commit');
    } finally {
      await su.end();
    }
    let v = await get(shop.s.safety, '/safety/chain/verify').expect(200);
    expect(v.body).toMatchObject({ ok: false, problem: 'link-broken', checked: 1 });
    expect(v.body.firstBad.seq).toBe(3);

    // A second shop: only the newest record is removed; the rows still chain, the head does not match.
    const other = await shopWithPpe('chain-trunc');
    for (let i = 0; i < 3; i++) await ppeCheck(other).expect(201);
    const su2 = await superuser();
    try {
      await su2.query('begin');
      await su2.query('set local session_replication_role = replica');
      await su2.query('delete from safety_ppe_check where sign_off_id in (select id from safety_sign_off where organization_id = $1 and seq = 3)', [
        other.orgId,
      ]);
      await su2.query('delete from safety_sign_off where organization_id = $1 and seq = 3', [other.orgId]);
      await su2.query('commit');
    } finally {
      await su2.end();
    }
    v = await get(other.s.safety, '/safety/chain/verify').expect(200);
    expect(v.body).toMatchObject({ ok: false, problem: 'head-mismatch', checked: 2, total: 2, headSeq: 3 });
    expect(v.body.message).toMatch(/newest records \(from #3\) were removed/);
  });

  it('keeps the chain linear under 20 concurrent signatures', async () => {
    const shop = await shopWithPpe('chain-race');
    const signers = [shop.s.operator, shop.s.technician, shop.s.safety];
    const results = await Promise.all(Array.from({ length: 20 }, (_, i) => ppeCheck(shop, signers[i % 3])));
    expect(results.map((r) => r.status)).toEqual(Array(20).fill(201));
    const c = await appRole();
    const rows = (await c.query('select seq, prev_hash, hash from safety_sign_off where organization_id = $1 order by seq', [shop.orgId])).rows;
    await c.end();
    expect(rows.map((r) => r.seq)).toEqual(Array.from({ length: 20 }, (_, i) => i + 1));
    expect(new Set(rows.map((r) => r.prev_hash)).size).toBe(20); // no two records share a predecessor: no fork
    for (let i = 1; i < rows.length; i++) expect(rows[i].prev_hash).toBe(rows[i - 1].hash);
    const v = await get(shop.s.safety, '/safety/chain/verify').expect(200);
    expect(v.body).toMatchObject({ ok: true, total: 20, headSeq: 20 });
  });

  it('keeps shops’ chains apart', async () => {
    const a = await shopWithPpe('chain-a');
    const b = await shopWithPpe('chain-b');
    await ppeCheck(a).expect(201);
    await ppeCheck(b).expect(201);
    await ppeCheck(a).expect(201);
    const va = await get(a.s.safety, '/safety/chain/verify').expect(200);
    const vb = await get(b.s.safety, '/safety/chain/verify').expect(200);
    expect(va.body).toMatchObject({ ok: true, total: 2 });
    expect(vb.body).toMatchObject({ ok: true, total: 1 });
  });

  it('refuses a wrong password with 401 and writes nothing', async () => {
    const shop = await shopWithPpe('chain-pw');
    const before = await countSignOffs(shop.orgId);
    const res = await post(shop.s.operator, '/safety/ppe/checks', {
      requirementId: shop.reqId,
      confirmed: ['safety-glasses', 'safety-footwear'],
      password: 'not my password',
    }).expect(401);
    expect(res.body.fields).toEqual([{ path: 'password', message: 'Wrong password: nothing was signed' }]);
    expect(res.body.message).toMatch(/nothing was signed/);
    expect(await countSignOffs(shop.orgId)).toBe(before);
    const checks = await get(shop.s.safety, '/safety/ppe/requirements').expect(200);
    expect(checks.body[0].lastCheckAt).toBeNull();
  });

  it('limits wrong passwords at signing per person, as at sign-in', async () => {
    const shop = await shopWithPpe('chain-limit');
    const body = (password: string) => ({ requirementId: shop.reqId, confirmed: ['safety-glasses', 'safety-footwear'], password });
    // Mistakes that are not a wrong password do not count.
    for (let i = 0; i < 3; i++) await post(shop.s.operator, '/safety/ppe/checks', { ...body(PASSWORD), confirmed: [] }).expect(400);
    for (let i = 0; i < 5; i++) await post(shop.s.operator, '/safety/ppe/checks', body('wrong')).expect(401);
    const limited = await post(shop.s.operator, '/safety/ppe/checks', body(PASSWORD)).expect(429);
    expect(limited.body.message).toMatch(/Too many wrong passwords at signing/);
    // Another person of the shop still signs.
    await post(shop.s.technician, '/safety/ppe/checks', body(PASSWORD)).expect(201);
    expect(await countSignOffs(shop.orgId)).toBe(1);
  });

  it('records a correction as a new signature that points at the old one; only the signer or the safety officer may', async () => {
    const shop = await shopWithPpe('chain-fix');
    await ppeCheck(shop).expect(201);
    const list = await get(shop.s.safety, '/safety/sign-offs').expect(200);
    const original = list.body.rows[0];
    await post(shop.s.technician, `/safety/sign-offs/${original.id}/corrections`, { note: 'Signed at the wrong machine', password: PASSWORD }).expect(403);
    await post(shop.s.operator, `/safety/sign-offs/${original.id}/corrections`, { note: 'x', password: PASSWORD }).expect(400);
    const fix = await post(shop.s.operator, `/safety/sign-offs/${original.id}/corrections`, {
      note: 'Signed at C1 but worked at PT1',
      password: PASSWORD,
    }).expect(201);
    expect(fix.body.seq).toBe(2);
    const after = await get(shop.s.safety, '/safety/sign-offs?sort=seq&dir=asc').expect(200);
    expect(after.body.rows[0]).toMatchObject({ seq: 1, correctedBy: [2], signerName: `operator of ${shop.slug}` });
    expect(after.body.rows[1]).toMatchObject({ seq: 2, meaning: 'correction', correctsSeq: 1, note: 'Signed at C1 but worked at PT1' });
    const v = await get(shop.s.safety, '/safety/chain/verify').expect(200);
    expect(v.body.ok).toBe(true);
  });
});
