import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { makeShop, makeTestApp, post, signIn, type SignedIn, type TestShop } from '../setup/test-app';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let a: TestShop;
let tech: SignedIn;
let admin: SignedIn;
let part: string;
let supplier: string;

const partRow = async () => (await tech.agent.get(`/api/part-types/${part}`).expect(200)).body;
const counts = async () => {
  const [r]: { requests: string; receipts: string; moves: string }[] = await t
    .em()
    .getConnection()
    .execute(
      `select (select count(*) from purchase_request where organization_id = ?) as requests,
              (select count(*) from purchase_receipt where organization_id = ?) as receipts,
              (select count(*) from stock_move where organization_id = ?) as moves`,
      [a.orgId, a.orgId, a.orgId],
    );
  return r;
};

beforeAll(async () => {
  t = await makeTestApp();
  a = await makeShop(t.em(), 'purchasing');
  tech = await signIn(t.app, a.users.technician.email);
  admin = await signIn(t.app, a.users.admin.email);
  supplier = (await post(admin, '/suppliers', { name: 'Torch parts wholesale', email: 'orders@torch-parts.example' }).expect(201)).body.id;
  part = (
    await post(tech, '/part-types', {
      partNumber: 'NZ-P',
      name: 'Nozzle',
      category: 'nozzle',
      leadTimeDays: 10,
      openingStock: 20,
      unitCost: 9,
      supplierId: supplier,
      packSize: 5,
      minOrderQty: 10,
    }).expect(201)
  ).body.id;
  // 15 used today: the reorder point rises above the 5 left on the shelf.
  await post(tech, '/stock-moves', { partTypeId: part, kind: 'used', quantity: -15, reason: 'Used' }).expect(201);
});
afterAll(() => t.close());

describe('purchase requests', () => {
  let id: string;

  it('the low flag stays lit while a request waits and clears once the parts are on order', async () => {
    const before = await partRow();
    expect(before).toMatchObject({ onHand: 5, onOrder: 0, low: true, supplierName: 'Torch parts wholesale', packSize: 5, minOrderQty: 10 });
    expect(before.reorderPoint).toBeGreaterThan(5);
    expect(before.reorderPoint).toBeLessThan(15);
    const res = await post(tech, '/purchase-requests', { partTypeId: part, quantity: 10, note: 'Running short' }).expect(201);
    id = res.body.id;
    expect(res.body.number).toBe(1);
    expect((await partRow()).low).toBe(true);
    // Only the admin approves and orders.
    await post(tech, `/purchase-requests/${id}/approve`).expect(403);
    await post(admin, `/purchase-requests/${id}/approve`).expect(200);
    expect((await partRow()).low).toBe(true);
    await post(admin, `/purchase-requests/${id}/approve`).expect(409);
    await post(admin, `/purchase-requests/${id}/order`).expect(200);
    expect(await partRow()).toMatchObject({ onHand: 5, onOrder: 10, low: false });
    const list = (await tech.agent.get('/api/purchase-requests').expect(200)).body;
    expect(list[0]).toMatchObject({
      number: 1,
      status: 'ordered',
      quantity: 10,
      received: 0,
      supplier: 'Torch parts wholesale',
      approvedBy: `admin of ${a.slug}`,
    });
  });

  it('takes partial receipts, raising stock each time, and closes the request when all is in', async () => {
    const r1 = await post(tech, `/purchase-requests/${id}/receipts`, { quantity: 4 }).expect(201);
    expect(r1.body).toEqual({ received: 4, status: 'ordered' });
    expect(await partRow()).toMatchObject({ onHand: 9, onOrder: 6 });
    // More than is still open: refused on the field, nothing written.
    const before = await counts();
    const over = await post(tech, `/purchase-requests/${id}/receipts`, { quantity: 7 }).expect(400);
    expect(over.body.fields).toEqual([{ path: 'quantity', message: 'Only 6 still open on request 1' }]);
    expect(await counts()).toEqual(before);
    const r2 = await post(tech, `/purchase-requests/${id}/receipts`, { quantity: 6 }).expect(201);
    expect(r2.body).toEqual({ received: 10, status: 'received' });
    expect(await partRow()).toMatchObject({ onHand: 15, onOrder: 0 });
    await post(tech, `/purchase-requests/${id}/receipts`, { quantity: 1 }).expect(409);
    const done = (await tech.agent.get('/api/purchase-requests?status=received').expect(200)).body;
    expect(done[0].receipts.map((x: { quantity: number }) => x.quantity)).toEqual([4, 6]);
  });

  it('refuses bad input naming the field, with nothing written', async () => {
    const before = await counts();
    const zero = await post(tech, '/purchase-requests', { partTypeId: part, quantity: 0 }).expect(400);
    expect(zero.body.fields[0].path).toBe('quantity');
    const pack = await post(tech, '/part-types', { partNumber: 'X-0', name: 'X zero', category: 'nozzle', leadTimeDays: 1, packSize: 0 }).expect(400);
    expect(pack.body.fields).toEqual([expect.objectContaining({ path: 'packSize' })]);
    const neg = await post(tech, '/part-types', { partNumber: 'X-0', name: 'X zero', category: 'nozzle', leadTimeDays: 1, unitCost: -2 }).expect(400);
    expect(neg.body.fields).toEqual([expect.objectContaining({ path: 'unitCost' })]);
    const sd = await post(tech, '/part-types', { partNumber: 'X-0', name: 'X zero', category: 'nozzle', leadTimeDays: 1, leadTimeSdDays: -1 }).expect(400);
    expect(sd.body.fields).toEqual([expect.objectContaining({ path: 'leadTimeSdDays' })]);
    const recNeg = await post(tech, `/purchase-requests/${id}/receipts`, { quantity: -1 }).expect(400);
    expect(recNeg.body.fields[0].path).toBe('quantity');
    expect(await counts()).toEqual(before);
  });

  it('suggests orders for the weeks ahead in whole packs, at least the minimum, as JSON and CSV', async () => {
    // Another 14 used: 1 left, nothing on order.
    await post(tech, '/stock-moves', { partTypeId: part, kind: 'used', quantity: -14, reason: 'Used' }).expect(201);
    const rows = (await tech.agent.get('/api/purchasing/suggestions?weeks=4').expect(200)).body;
    const row = rows.find((r: { partTypeId: string }) => r.partTypeId === part);
    expect(row.basis).toBe('daily-use');
    // 29 used over the 90-day window → 29/90 a day × 28 days, plus the reorder point, less 1 on hand.
    const shortfall = (29 / 90) * 28 + row.reorderPoint - 1;
    expect(row.expectedUse).toBeCloseTo((29 / 90) * 28, 9);
    expect(row.quantity).toBe(Math.max(10, Math.ceil(shortfall / 5) * 5));
    expect(row.quantity % 5).toBe(0);
    const csv = await tech.agent.get('/api/purchasing/suggestions.csv?weeks=4').expect(200);
    expect(csv.headers['content-type']).toMatch(/text\/csv/);
    expect(csv.text.split('\r\n')[0]).toBe(
      'Supplier,Part number,Name,Quantity,Unit,Pack size,Minimum order,Expected use,Based on,On hand,On order,Requested,Reorder point,Unit cost,Line cost',
    );
    expect(csv.text).toContain(`Torch parts wholesale,NZ-P,Nozzle,${row.quantity},pcs,5,10`);
    await tech.agent.get('/api/purchasing/suggestions?weeks=0').expect(400);
  });
});
