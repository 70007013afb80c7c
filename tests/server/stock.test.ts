import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { makeShop, makeTestApp, post, signIn, type SignedIn, type TestShop } from '../setup/test-app';
import { StockMove } from '../../server/modules/stock/stock.entity';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let a: TestShop;
let b: TestShop;
let tech: SignedIn;
let op: SignedIn;
let otherTech: SignedIn;
let electrode: string;

async function moveCount(orgId: string) {
  const em = t.em();
  em.setFilterParams('org', { orgId });
  return em.count(StockMove, {});
}

beforeAll(async () => {
  t = await makeTestApp();
  a = await makeShop(t.em(), 'stock-a');
  b = await makeShop(t.em(), 'stock-b');
  tech = await signIn(t.app, a.users.technician.email);
  op = await signIn(t.app, a.users.operator.email);
  otherTech = await signIn(t.app, b.users.technician.email);
});
afterAll(() => t.close());

describe('part catalogue and stock', () => {
  it('creates a part with its opening stock recorded as a move', async () => {
    const res = await post(tech, '/part-types', {
      partNumber: 'EL-130-A',
      name: 'Electrode 130 A air',
      category: 'electrode',
      lifeUnit: 'starts',
      expectedLife: 1200,
      unitCost: 14.5,
      leadTimeDays: 7,
      openingStock: 20,
    }).expect(201);
    electrode = res.body.id;
    const part = await op.agent.get(`/api/part-types/${electrode}`).expect(200);
    expect(part.body).toMatchObject({ partNumber: 'EL-130-A', onHand: 20, unitCost: 14.5, serviceLevel: 0.95, reorderPoint: 0, low: false });
    const moves = await op.agent.get(`/api/part-types/${electrode}/moves`).expect(200);
    expect(moves.body.rows).toEqual([
      expect.objectContaining({ kind: 'adjusted', quantity: 20, onHandAfter: 20, reason: 'Opening stock', by: `technician of ${a.slug}` }),
    ]);
  });

  it('refuses a duplicate part number and bad input, naming the fields', async () => {
    const dup = await post(tech, '/part-types', { partNumber: 'EL-130-A', name: 'Again', category: 'electrode', leadTimeDays: 3 }).expect(409);
    expect(dup.body.fields[0].path).toBe('partNumber');
    const bad = await post(tech, '/part-types', { partNumber: '', name: 'X', category: 'sprocket', leadTimeDays: -1, unitCost: -2 }).expect(400);
    expect(bad.body.fields.map((f: { path: string }) => f.path).sort()).toEqual(['category', 'leadTimeDays', 'name', 'partNumber', 'unitCost']);
  });

  it('records receipts and use as moves, and refuses taking more than is on hand with nothing written', async () => {
    await post(tech, '/stock-moves', { partTypeId: electrode, kind: 'received', quantity: 10, reason: 'Order 4471' }).expect(201);
    const use = await post(tech, '/stock-moves', { partTypeId: electrode, kind: 'used', quantity: -3 }).expect(201);
    expect(use.body.onHand).toBe(27);
    const before = await moveCount(a.orgId);
    const tooMany = await post(tech, '/stock-moves', { partTypeId: electrode, kind: 'used', quantity: -28 }).expect(400);
    expect(tooMany.body.message).toBe('Not enough Electrode 130 A air (EL-130-A) in stock: 27 pcs on hand, 28 needed');
    const wrongSign = await post(tech, '/stock-moves', { partTypeId: electrode, kind: 'received', quantity: -1 }).expect(400);
    expect(wrongSign.body.fields[0]).toEqual({ path: 'quantity', message: 'A receipt adds stock: enter a positive quantity' });
    const noReason = await post(tech, '/stock-moves', { partTypeId: electrode, kind: 'adjusted', quantity: -1 }).expect(400);
    expect(noReason.body.fields[0].path).toBe('reason');
    expect(await moveCount(a.orgId)).toBe(before);
    await post(op, '/stock-moves', { partTypeId: electrode, kind: 'used', quantity: -1 }).expect(403);
  });

  it('computes the reorder point from the last 90 days of use and flags low stock', async () => {
    // 2 electrodes used on each of 30 days within the window (backdated rows), none on the other 60.
    const em = t.em();
    for (let i = 1; i <= 30; i++) {
      await em.execute(
        `insert into stock_move (id, created_at, updated_at, organization_id, part_type_id, kind, quantity, on_hand_after)
         values (gen_random_uuid(), now() - make_interval(days => ?), now(), ?, ?, 'used', -2, 0)`,
        [i * 2, a.orgId, electrode],
      );
    }
    const part = (await op.agent.get(`/api/part-types/${electrode}`).expect(200)).body;
    // Today's 3 used (one move above) join the 60: 63 over 90 days.
    const days = [3, ...new Array(30).fill(2), ...new Array(59).fill(0)];
    const mean = days.reduce((s, d) => s + d, 0) / 90;
    const sd = Math.sqrt(days.reduce((s, d) => s + (d - mean) ** 2, 0) / 89); // sample sd, n − 1 (NIST e-Handbook §1.3.5.6)
    expect(part.usagePerDay).toBeCloseTo(0.7, 10);
    expect(part.usageSdPerDay).toBeCloseTo(sd, 10);
    // ROP = d̄·L + z·σ·√L with z(0.95) = 1.6449 (standard normal table), L = 7 days, rounded up.
    const rop = Math.ceil(mean * 7 + 1.6448536 * sd * Math.sqrt(7));
    expect(rop).toBe(10); // 4.9 + 4.25 = 9.15, rounded up
    expect(part.reorderPoint).toBe(rop);
    expect(part.low).toBe(false); // 27 on hand
    await post(tech, '/stock-moves', { partTypeId: electrode, kind: 'adjusted', quantity: -19, reason: 'Stocktake' }).expect(201);
    const low = await op.agent.get('/api/part-types?lowOnly=true').expect(200);
    expect(low.body.map((p: { partNumber: string; onHand: number }) => `${p.partNumber}:${p.onHand}`)).toEqual(['EL-130-A:8']);
  });

  it("keeps another shop's parts out of reach", async () => {
    await otherTech.agent.get(`/api/part-types/${electrode}`).expect(404);
    const res = await post(otherTech, '/stock-moves', { partTypeId: electrode, kind: 'received', quantity: 5 }).expect(404);
    expect(res.body.message).toBe('Part not found');
    expect((await otherTech.agent.get('/api/part-types').expect(200)).body).toEqual([]);
  });
});

describe('costs in the shop currency', () => {
  it("gives each part the currency from the shop's settings, and none when unset or not a currency code", async () => {
    const setCurrency = (v: unknown) =>
      t
        .em()
        .getConnection()
        .execute(`update organization set settings = jsonb_set(coalesce(settings, '{}'::jsonb), '{currency}', ?::jsonb) where id = ?`, [
          JSON.stringify(v),
          a.orgId,
        ]);
    const row = async () => (await op.agent.get(`/api/part-types/${electrode}`).expect(200)).body;
    expect((await row()).currency).toBeNull();
    await setCurrency('EUR');
    expect((await row()).currency).toBe('EUR');
    expect((await op.agent.get('/api/part-types').expect(200)).body.every((p: { currency: string }) => p.currency === 'EUR')).toBe(true);
    expect((await otherTech.agent.get('/api/part-types').expect(200)).body.every((p: { currency: string | null }) => p.currency === null)).toBe(true);
    await setCurrency('euros');
    expect((await row()).currency).toBeNull();
  });
});
