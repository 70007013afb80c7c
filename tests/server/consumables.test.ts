import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { makeShop, makeTestApp, post, signIn, type SignedIn, type TestShop } from '../setup/test-app';
import { ConsumableChange, ConsumableInstall, ConsumablePhoto } from '../../server/modules/station/consumable.entity';
import { MeterReading } from '../../server/modules/meters/meter.entity';
import { StockMove } from '../../server/modules/stock/stock.entity';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let a: TestShop;
let b: TestShop;
let tech: SignedIn;
let op: SignedIn;
let otherOp: SignedIn;
let torch: string;
let electrode: string;
let nozzle: string;
let startsMeter: string;
let hoursMeter: string;

const hoursAgo = (h: number) => new Date(Date.now() - h * 3600_000).toISOString();
// A real PNG: signature, IHDR for a 1×1 image, IDAT, IEND.
const PNG = Buffer.from('iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNk+M9QDwADhgGAWjR9awAAAABJRU5ErkJggg==', 'base64');

async function counts(orgId: string) {
  const em = t.em();
  em.setFilterParams('org', { orgId });
  return {
    changes: await em.count(ConsumableChange, {}),
    installs: await em.count(ConsumableInstall, {}),
    open: await em.count(ConsumableInstall, { removedAt: null }),
    moves: await em.count(StockMove, {}),
    readings: await em.count(MeterReading, {}),
    photos: await em.count(ConsumablePhoto, {}),
  };
}
const station = async (s: SignedIn = op) => (await s.agent.get('/api/stations/c1').expect(200)).body;

beforeAll(async () => {
  t = await makeTestApp();
  a = await makeShop(t.em(), 'cons-a');
  b = await makeShop(t.em(), 'cons-b');
  tech = await signIn(t.app, a.users.technician.email);
  op = await signIn(t.app, a.users.operator.email);
  otherOp = await signIn(t.app, b.users.operator.email);
  const cell = (await post(tech, '/machines', { code: 'C1', name: 'Cell 1', kind: 'punch-plasma-cell' }).expect(201)).body.id;
  torch = (await post(tech, '/machines', { code: 'C1-T', name: 'Torch', kind: 'torch', parentId: cell }).expect(201)).body.id;
  startsMeter = (await post(tech, '/meters', { machineId: torch, code: 'arc-starts', name: 'Arc starts', kind: 'count', unit: 'starts' }).expect(201)).body.id;
  hoursMeter = (await post(tech, '/meters', { machineId: torch, code: 'arc-hours', name: 'Arc hours', kind: 'running-time', unit: 'h' }).expect(201)).body.id;
  electrode = (
    await post(tech, '/part-types', {
      partNumber: 'EL-1',
      name: 'Electrode',
      category: 'electrode',
      lifeUnit: 'starts',
      expectedLife: 1000,
      unitCost: 12,
      leadTimeDays: 5,
      openingStock: 10,
    }).expect(201)
  ).body.id;
  nozzle = (
    await post(tech, '/part-types', {
      partNumber: 'NZ-1',
      name: 'Nozzle',
      category: 'nozzle',
      lifeUnit: 'starts',
      expectedLife: 800,
      unitCost: 9,
      leadTimeDays: 5,
      openingStock: 10,
    }).expect(201)
  ).body.id;
  await post(op, `/meters/${startsMeter}/readings`, { value: 1000, readAt: hoursAgo(48) }).expect(201);
  await post(op, `/meters/${hoursMeter}/readings`, { value: 10, readAt: hoursAgo(48) }).expect(201);
});
afterAll(() => t.close());

describe('consumable changes at the station', () => {
  it('installs the first set, taking the parts out of stock', async () => {
    const res = await post(op, '/consumable-changes', {
      torchId: torch,
      categories: ['electrode', 'nozzle'],
      partTypeIds: { electrode, nozzle },
      reason: 'preventive',
      changedAt: hoursAgo(47),
    }).expect(201);
    expect(res.body).toMatchObject({ closed: 0, opened: 2 });
    const s = await station();
    expect(s.torches).toHaveLength(1);
    expect(s.torches[0].installed.map((i: { category: string; startsSince: number }) => `${i.category}:${i.startsSince}`)).toEqual(['electrode:0', 'nozzle:0']);
    expect(s.torches[0].installed[0].partType.onHand).toBe(9);
  });

  it('shows life since installation against the expected life', async () => {
    await post(op, `/meters/${startsMeter}/readings`, { value: 1600, readAt: hoursAgo(2) }).expect(201);
    await post(op, `/meters/${hoursMeter}/readings`, { value: 14.5, readAt: hoursAgo(2) }).expect(201);
    const s = await station();
    const [el, nz] = s.torches[0].installed;
    expect(el).toMatchObject({ startsSince: 600, arcHoursSince: 4.5, used: 600, expected: 1000, fraction: 0.6, expectedSource: 'catalogue' });
    expect(nz.fraction).toBeCloseTo(600 / 800, 12);
    expect(s.torches[0].startsMeter.latest.value).toBe(1600);
  });

  it('logs a change in one go: closes the old parts with their life, opens new ones, takes stock', async () => {
    const before = await counts(a.orgId);
    const res = await post(op, '/consumable-changes', { torchId: torch, categories: ['electrode', 'nozzle'], reason: 'normal-wear', pitDepthMm: 1.1 }).expect(
      201,
    );
    expect(res.body).toMatchObject({ closed: 2, opened: 2 });
    const after = await counts(a.orgId);
    expect(after).toMatchObject({
      changes: before.changes + 1,
      installs: before.installs + 2,
      open: before.open,
      moves: before.moves + 2,
      readings: before.readings,
    });
    const s = await station();
    expect(s.torches[0].installed.map((i: { startsSince: number; partType: { onHand: number } }) => [i.startsSince, i.partType.onHand])).toEqual([
      [0, 8],
      [0, 8],
    ]);
    const change = s.recentChanges[0];
    expect(change).toMatchObject({ startsReading: 1600, arcHoursReading: 14.5, pitDepthMm: 1.1, by: `operator of ${a.slug}` });
    // Life = counter at removal − counter at installation: 1600 − 1000 starts, 14.5 − 10 h.
    // One reason for the change: the electrode wore out, the nozzle came out with it.
    expect(change.parts).toEqual([
      { category: 'electrode', partNumber: 'EL-1', reason: 'worn', lifeStarts: 600, lifeArcHours: 4.5 },
      { category: 'nozzle', partNumber: 'NZ-1', reason: 'with-partner', lifeStarts: 600, lifeArcHours: 4.5 },
    ]);
  });

  it('records typed-in counters as readings, and refuses a backwards counter on its field with nothing written', async () => {
    const before = await counts(a.orgId);
    const bad = await post(op, '/consumable-changes', { torchId: torch, categories: ['electrode'], reason: 'failed-start', startsReading: 1500 }).expect(400);
    expect(bad.body.fields[0].path).toBe('startsReading');
    expect(bad.body.message).toMatch(/Arc starts: 1,500 starts is lower than the reading before it \(1,600 starts/);
    const neg = await post(op, '/consumable-changes', { torchId: torch, categories: ['electrode'], reason: 'failed-start', startsReading: -3 }).expect(400);
    expect(neg.body.fields[0]).toEqual({ path: 'startsReading', message: 'The arc start count cannot be negative' });
    expect(await counts(a.orgId)).toEqual(before);
    await post(op, '/consumable-changes', {
      torchId: torch,
      categories: ['electrode'],
      reason: 'failed-start',
      startsReading: 1750,
      arcHoursReading: 15,
    }).expect(201);
    const after = await counts(a.orgId);
    expect(after.readings).toBe(before.readings + 2);
    const s = await station();
    expect(s.recentChanges[0].parts).toEqual([{ category: 'electrode', partNumber: 'EL-1', reason: 'failed-start', lifeStarts: 150, lifeArcHours: 0.5 }]);
  });

  it('refuses when stock runs out, leaving the typed counter and everything else unwritten', async () => {
    await post(tech, '/stock-moves', { partTypeId: nozzle, kind: 'adjusted', quantity: -8, reason: 'Stocktake: none left' }).expect(201);
    const before = await counts(a.orgId);
    const res = await post(op, '/consumable-changes', {
      torchId: torch,
      categories: ['electrode', 'nozzle'],
      reason: 'normal-wear',
      startsReading: 1900,
    }).expect(400);
    expect(res.body.message).toBe('Not enough Nozzle (NZ-1) in stock: 0 pcs on hand, 1 needed');
    expect(await counts(a.orgId)).toEqual(before);
    // Parts from outside the shop's stock can still be logged.
    await post(op, '/consumable-changes', { torchId: torch, categories: ['nozzle'], reason: 'damaged', takeFromStock: false }).expect(201);
    await post(tech, '/stock-moves', { partTypeId: nozzle, kind: 'received', quantity: 20, reason: 'Order 5' }).expect(201);
  });

  it('refuses parts of the wrong kind and a pit depth without an electrode', async () => {
    const wrong = await post(op, '/consumable-changes', {
      torchId: torch,
      categories: ['electrode'],
      partTypeIds: { electrode: nozzle },
      reason: 'normal-wear',
    }).expect(400);
    expect(wrong.body.fields[0]).toEqual({ path: 'partTypeIds.electrode', message: 'NZ-1 is a nozzle, not an electrode' });
    const pit = await post(op, '/consumable-changes', { torchId: torch, categories: ['nozzle'], reason: 'normal-wear', pitDepthMm: 0.8 }).expect(400);
    expect(pit.body.fields[0]).toEqual({ path: 'pitDepthMm', message: 'A pit depth belongs to an electrode change' });
    const none = await post(op, '/consumable-changes', { torchId: torch, categories: [], reason: 'sad' }).expect(400);
    expect(none.body.fields.map((f: { path: string }) => f.path).sort()).toEqual(['categories', 'reason']);
  });

  it('stores a photo checked by content, and refuses a file that is not an image with nothing written', async () => {
    const before = await counts(a.orgId);
    const notImage = await op.agent
      .post('/api/consumable-changes')
      .set('X-CSRF-Token', op.csrf)
      .field('data', JSON.stringify({ torchId: torch, categories: ['electrode'], reason: 'normal-wear' }))
      .attach('photo', Buffer.from('%PDF-1.4 pretending to be a photo'), { filename: 'pit.jpg', contentType: 'image/jpeg' })
      .expect(400);
    expect(notImage.body.fields[0].path).toBe('photo');
    expect(notImage.body.message).toMatch(/not an image/);
    expect(await counts(a.orgId)).toEqual(before);

    const ok = await op.agent
      .post('/api/consumable-changes')
      .set('X-CSRF-Token', op.csrf)
      .field('data', JSON.stringify({ torchId: torch, categories: ['electrode'], reason: 'normal-wear', pitDepthMm: 0.9 }))
      .attach('photo', PNG, { filename: 'pit.png', contentType: 'image/png' })
      .expect(201);
    const photo = await op.agent.get(`/api/consumable-changes/${ok.body.id}/photo`).expect(200);
    expect(photo.headers['content-type']).toBe('image/png');
    expect(Buffer.compare(photo.body as Buffer, PNG)).toBe(0);
    const big = await op.agent
      .post('/api/consumable-changes')
      .set('X-CSRF-Token', op.csrf)
      .field('data', JSON.stringify({ torchId: torch, categories: ['electrode'], reason: 'normal-wear' }))
      .attach('photo', Buffer.concat([PNG, Buffer.alloc(8 * 1024 * 1024)]), { filename: 'huge.png', contentType: 'image/png' })
      .expect(413);
    expect(big.body.message).toMatch(/larger than 8 MB/);
  });

  it("answers 404 for a change on another shop's torch and writes nothing", async () => {
    const before = await counts(a.orgId);
    const res = await post(otherOp, '/consumable-changes', { torchId: torch, categories: ['electrode', 'nozzle'], reason: 'normal-wear' }).expect(404);
    expect(res.body.message).toBe('Torch not found');
    await otherOp.agent.get('/api/stations/C1').expect(404);
    expect(await counts(a.orgId)).toEqual(before);
    expect(await counts(b.orgId)).toMatchObject({ changes: 0, moves: 0, readings: 0 });
  });

  it('lets the safety officer read the station but not log a change', async () => {
    const safety = await signIn(t.app, a.users.safety.email);
    await station(safety);
    await post(safety, '/consumable-changes', { torchId: torch, categories: ['electrode'], reason: 'normal-wear' }).expect(403);
  });

  it('keeps reference values with their source, overridable by the site', async () => {
    const s = await station();
    expect(s.reference.cutToleranceMm).toMatchObject({ value: 0.2, unit: 'mm', overridden: false });
    expect(s.reference.pitLimitMm.source).toMatch(/Common practice/);
    const admin = await signIn(t.app, a.users.admin.email);
    const res = await admin.agent.patch('/api/consumable-settings').set('X-CSRF-Token', admin.csrf).send({ cutToleranceMm: 0.3 }).expect(200);
    expect(res.body.cutToleranceMm).toMatchObject({ value: 0.3, overridden: true });
    expect(res.body.cutToleranceMm.source).toMatch(/^Site setting \(default 0.2 mm/);
    await admin.agent.patch('/api/consumable-settings').set('X-CSRF-Token', admin.csrf).send({ cutToleranceMm: -1 }).expect(400);
    await admin.agent.patch('/api/consumable-settings').set('X-CSRF-Token', admin.csrf).send({ cutToleranceMm: null }).expect(200);
  });
});

describe('a counter reset or replaced at a change', () => {
  it('takes a lower counter when marked as a reset, records it as a reset, and counts life across it', async () => {
    const cell = (await post(tech, '/machines', { code: 'C9', name: 'Cell 9', kind: 'punch-plasma-cell' }).expect(201)).body.id;
    const t9 = (await post(tech, '/machines', { code: 'C9-T', name: 'Torch', kind: 'torch', parentId: cell }).expect(201)).body.id;
    const m9 = (await post(tech, '/meters', { machineId: t9, code: 'arc-starts', name: 'Arc starts', kind: 'count', unit: 'starts' }).expect(201)).body.id;
    await post(op, `/meters/${m9}/readings`, { value: 250_000, readAt: hoursAgo(30) }).expect(201);
    await post(op, '/consumable-changes', {
      torchId: t9,
      categories: ['electrode'],
      partTypeIds: { electrode },
      reason: 'preventive',
      changedAt: hoursAgo(29),
      takeFromStock: false,
    }).expect(201);
    await post(op, `/meters/${m9}/readings`, { value: 250_400, readAt: hoursAgo(20) }).expect(201);

    const refused = await post(op, '/consumable-changes', {
      torchId: t9,
      categories: ['electrode'],
      reason: 'normal-wear',
      startsReading: 30,
      takeFromStock: false,
    }).expect(400);
    expect(refused.body.fields[0].path).toBe('startsReading');
    expect(refused.body.message).toMatch(/30 starts is lower than the reading before it \(250,400 starts/);
    const empty = await post(op, '/consumable-changes', {
      torchId: t9,
      categories: ['electrode'],
      reason: 'normal-wear',
      startsReset: true,
      takeFromStock: false,
    }).expect(400);
    expect(empty.body.fields[0].path).toBe('startsReading');

    await post(op, '/consumable-changes', {
      torchId: t9,
      categories: ['electrode'],
      reason: 'normal-wear',
      startsReading: 30,
      startsReset: true,
      takeFromStock: false,
    }).expect(201);
    const readings = (await op.agent.get(`/api/meters/${m9}/readings?dir=desc`).expect(200)).body.rows;
    expect(readings[0]).toMatchObject({ value: 30, isReset: true, source: 'consumable-change' });
    // Life: 400 starts before the reset plus 30 after it.
    const s = (await op.agent.get('/api/stations/C9').expect(200)).body;
    expect(s.recentChanges[0].parts).toEqual([{ category: 'electrode', partNumber: 'EL-1', reason: 'worn', lifeStarts: 430, lifeArcHours: null }]);
  });
});
