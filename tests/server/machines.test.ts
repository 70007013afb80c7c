import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { makeShop, makeTestApp, post, patch, signIn, type SignedIn, type TestShop } from '../setup/test-app';
import { MeterReading } from '../../server/modules/meters/meter.entity';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let a: TestShop;
let b: TestShop;
let tech: SignedIn;
let op: SignedIn;
let otherTech: SignedIn;

beforeAll(async () => {
  t = await makeTestApp();
  a = await makeShop(t.em(), 'mach-a');
  b = await makeShop(t.em(), 'mach-b');
  tech = await signIn(t.app, a.users.technician.email);
  op = await signIn(t.app, a.users.operator.email);
  otherTech = await signIn(t.app, b.users.technician.email);
});
afterAll(() => t.close());

describe('machines and components', () => {
  let cell: string;
  let torch: string;

  it('creates a machine and a component below it, listed as a tree', async () => {
    const res = await post(tech, '/machines', {
      code: 'C1',
      name: 'Punch/plasma cell 1',
      kind: 'punch-plasma-cell',
      location: 'Bay 2',
      serial: 'SN-0001',
      notes: '',
    }).expect(201);
    cell = res.body.id;
    const comp = await post(tech, '/machines', { code: 'C1-T', name: 'Torch of cell 1', kind: 'torch', parentId: cell }).expect(201);
    torch = comp.body.id;
    await post(tech, '/machines', { code: 'A0', name: 'A standalone table', kind: 'plasma-table' }).expect(201);
    const list = await op.agent.get('/api/machines').expect(200);
    expect(list.body.map((m: { code: string; depth: number }) => `${m.code}:${m.depth}`)).toEqual(['A0:0', 'C1:0', 'C1-T:1']);
    const detail = await op.agent.get(`/api/machines/${cell}`).expect(200);
    expect(detail.body.components.map((c: { code: string }) => c.code)).toEqual(['C1-T']);
    expect(detail.body.notes).toBeNull(); // empty text becomes null
  });

  it('refuses a duplicate code (any case), a loop in the tree and bad input, naming the field', async () => {
    const dup = await post(tech, '/machines', { code: 'c1', name: 'Another', kind: 'other' }).expect(409);
    expect(dup.body.fields).toEqual([{ path: 'code', message: 'Code C1 is taken' }]);
    const loop = await patch(tech, `/machines/${cell}`, { parentId: torch }).expect(400);
    expect(loop.body.fields[0]).toMatchObject({ path: 'parentId', message: 'A machine cannot sit below one of its own components' });
    const bad = await post(tech, '/machines', { code: 'has space', name: 'X', kind: 'spaceship' }).expect(400);
    expect(bad.body.fields.map((f: { path: string }) => f.path).sort()).toEqual(['code', 'kind', 'name']);
  });

  it('lets operators read but not edit', async () => {
    await post(op, '/machines', { code: 'X9', name: 'Not allowed', kind: 'other' }).expect(403);
    await patch(op, `/machines/${cell}`, { name: 'Renamed' }).expect(403);
  });

  it("answers 404 for another shop's machine", async () => {
    await otherTech.agent.get(`/api/machines/${cell}`).expect(404);
    await patch(otherTech, `/machines/${cell}`, { name: 'Stolen' }).expect(404);
    const list = await otherTech.agent.get('/api/machines').expect(200);
    expect(list.body).toEqual([]);
  });

  it('deactivates a machine: hidden from the list unless asked for', async () => {
    const res = await post(tech, '/machines', { code: 'OLD', name: 'Retired saw', kind: 'other' }).expect(201);
    await patch(tech, `/machines/${res.body.id}`, { active: false }).expect(200);
    const list = await tech.agent.get('/api/machines').expect(200);
    expect(list.body.some((m: { code: string }) => m.code === 'OLD')).toBe(false);
    const all = await tech.agent.get('/api/machines?includeInactive=true').expect(200);
    expect(all.body.find((m: { code: string }) => m.code === 'OLD').active).toBe(false);
  });

  describe('meters and readings', () => {
    let starts: string;
    let dp: string;

    it('creates meters with units that fit their kind, and refuses those that do not', async () => {
      starts = (await post(tech, '/meters', { machineId: torch, code: 'arc-starts', name: 'Arc starts', kind: 'count', unit: 'starts' }).expect(201)).body.id;
      dp = (
        await post(tech, '/meters', {
          machineId: torch,
          code: 'filter-dp',
          name: 'Filter pressure drop',
          kind: 'condition',
          unit: 'Pa',
          upperLimit: 1500,
        }).expect(201)
      ).body.id;
      const wrong = await post(tech, '/meters', { machineId: torch, code: 'hrs', name: 'Hours', kind: 'running-time', unit: 'starts' }).expect(400);
      expect(wrong.body.fields).toEqual([{ path: 'unit', message: 'A running-time meter counts in h; “starts” is not one of them' }]);
      const limits = await post(tech, '/meters', { machineId: torch, code: 'x', name: 'Count with limit', kind: 'count', unit: 'hits', upperLimit: 5 }).expect(
        400,
      );
      expect(limits.body.fields[0].path).toBe('upperLimit');
      await post(tech, '/meters', { machineId: torch, code: 'arc-starts', name: 'Twice', kind: 'count', unit: 'starts' }).expect(409);
    });

    it('accepts rising counts, refuses a backwards or negative count with a clear message, and accepts a reset', async () => {
      const day = (d: number) => new Date(Date.UTC(2026, 0, d, 8)).toISOString();
      await post(op, `/meters/${starts}/readings`, { value: 1000, readAt: day(1) }).expect(201);
      await post(op, `/meters/${starts}/readings`, { value: 1500, readAt: day(3) }).expect(201);
      const back = await post(op, `/meters/${starts}/readings`, { value: 1200, readAt: day(4) }).expect(400);
      expect(back.body.fields[0].path).toBe('value');
      // The time is the shop's (America/Chicago), as the screens show readings: 08:00 UTC is 02:00 there.
      expect(back.body.message).toMatch(
        /Arc starts: 1,200 starts is lower than the reading before it \(1,500 starts on 3 Jan 2026, 02:00\); record it as a reset/,
      );
      // A backfilled reading higher than a later one is refused too.
      const ahead = await post(op, `/meters/${starts}/readings`, { value: 1700, readAt: day(2) }).expect(400);
      expect(ahead.body.message).toMatch(/higher than a later reading \(1,500 starts/);
      const neg = await post(op, `/meters/${starts}/readings`, { value: -5, readAt: day(5), isReset: true }).expect(400);
      expect(neg.body.message).toMatch(/cannot be negative/);
      await post(op, `/meters/${starts}/readings`, { value: 20, readAt: day(5), isReset: true }).expect(201);
      const future = await post(op, `/meters/${starts}/readings`, { value: 30, readAt: new Date(Date.now() + 86_400_000).toISOString() }).expect(400);
      expect(future.body.fields[0]).toMatchObject({ path: 'readAt', message: 'The reading time lies in the future' });
      const nan = await post(op, `/meters/${starts}/readings`, { value: 'lots' }).expect(400);
      expect(nan.body.fields[0]).toMatchObject({ path: 'value', message: 'Enter the reading as a number' });

      const page = await op.agent.get(`/api/meters/${starts}/readings`).expect(200);
      expect(page.body.total).toBe(3);
      expect(page.body.rows.map((r: { value: number }) => r.value)).toEqual([20, 1500, 1000]);
      const em = t.em();
      em.setFilterParams('org', { orgId: a.orgId });
      expect(await em.count(MeterReading, { meter: starts })).toBe(3); // the refused ones left nothing
    });

    it('lets condition readings go down as well as up', async () => {
      await post(op, `/meters/${dp}/readings`, { value: 900, readAt: '2026-01-02T08:00:00Z' }).expect(201);
      await post(op, `/meters/${dp}/readings`, { value: 600, readAt: '2026-01-03T08:00:00Z' }).expect(201);
      const m = await op.agent.get(`/api/meters/${dp}`).expect(200);
      expect(m.body.latest).toMatchObject({ value: 600 });
    });

    it('gives a trend with the usage rate fitted after the last reset', async () => {
      const res = await op.agent.get(`/api/meters/${starts}/trend?days=3660`).expect(200);
      expect(res.body.points.map((p: { value: number }) => p.value)).toEqual([1000, 1500, 20]);
      expect(res.body.ratePerDay).toBeNull(); // only one reading since the reset
      const detail = await op.agent.get(`/api/machines/${cell}`).expect(200);
      expect(detail.body.meters.map((m: { code: string }) => m.code)).toEqual(['arc-starts', 'filter-dp']);
    });

    it('records several counters at once, all or none, naming the refused one', async () => {
      const before = (await op.agent.get(`/api/meters/${starts}/readings`).expect(200)).body.total;
      const bad = await post(op, '/meter-readings', {
        readings: [
          { meterId: dp, value: 700 },
          { meterId: starts, value: 5 },
        ],
      }).expect(400);
      expect(bad.body.fields[0].path).toBe('readings.1.value');
      expect(bad.body.message).toMatch(/Arc starts: 5 starts is lower than the reading before it \(20 starts/);
      expect((await op.agent.get(`/api/meters/${starts}/readings`).expect(200)).body.total).toBe(before);
      expect((await op.agent.get(`/api/meters/${dp}`).expect(200)).body.latest.value).toBe(600);
      await post(op, '/meter-readings', {
        readings: [
          { meterId: dp, value: 700 },
          { meterId: starts, value: 45 },
        ],
      }).expect(201);
      expect((await op.agent.get(`/api/meters/${starts}`).expect(200)).body.latest.value).toBe(45);
      await post(otherTech, '/meter-readings', { readings: [{ meterId: starts, value: 99 }] }).expect(400);
    });

    it("keeps another shop's meters out of reach", async () => {
      await otherTech.agent.get(`/api/meters/${starts}`).expect(404);
      await post(otherTech, `/meters/${starts}/readings`, { value: 99999 }).expect(404);
      await post(otherTech, '/meters', { machineId: torch, code: 'sneaky', name: 'Sneaky', kind: 'count', unit: 'hits' }).expect(400);
    });
  });
});
