import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { makeTestApp } from '../setup/test-app';
import { approvedProcedure, get, lockPoints, makeSafetyShop, PASSWORD, post, type SafetyShop } from './safety-helpers';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let shop: SafetyShop;
let other: SafetyShop;
let head: string;

beforeAll(async () => {
  t = await makeTestApp();
  shop = await makeSafetyShop(t.app, t.em(), 'station-a');
  other = await makeSafetyShop(t.app, t.em(), 'station-b');
  head = (await post(shop.s.technician, '/machines', { code: 'C1-PH', name: 'Punch head', kind: 'punch-head', parentId: shop.machineId }).expect(201)).body.id;
});
afterAll(() => t.close());

const station = async (who = shop.s.operator, code = 'C1') => (await get(who, `/stations/${code}`).expect(200)).body;

describe('station view: lockouts and work due', () => {
  it('lists open work orders on the machine and its components, soonest first, and none of another machine or shop', async () => {
    expect((await station()).due).toEqual([]);
    const onCell = (await post(shop.s.operator, '/work-orders', { machineId: shop.machineId, title: 'Guard door latch sticks' }).expect(201)).body.id;
    const onHead = (await post(shop.s.operator, '/work-orders', { machineId: head, title: 'Stripper plate worn', requiresLockout: true }).expect(201)).body.id;
    await post(shop.s.operator, '/work-orders', { machineId: shop.otherMachineId, title: 'Table slats bent' }).expect(201);
    await post(other.s.operator, '/work-orders', { machineId: other.machineId, title: 'Other shop work' }).expect(201);

    const s = await station();
    expect(s.due.map((w: { id: string }) => w.id).sort()).toEqual([onCell, onHead].sort());
    const row = s.due.find((w: { id: string }) => w.id === onHead);
    expect(row).toMatchObject({ machineCode: 'C1-PH', title: 'Stripper plate worn', status: 'open', overdue: false, requiresLockout: true });
    // The operator sees at the machine which work needs it locked out.
    expect(s.due.find((w: { id: string }) => w.id === onCell).requiresLockout).toBe(false);
    expect(typeof row.number).toBe('number');
    // The component's own station page shows only its own work.
    expect((await station(shop.s.operator, 'C1-PH')).due.map((w: { id: string }) => w.id)).toEqual([onHead]);
    expect((await station(other.s.operator)).due.map((w: { title: string }) => w.title)).toEqual(['Other shop work']);
  });

  it('reports a lockout on the machine while it is applied, to this shop only', async () => {
    expect((await station()).lockouts).toEqual([]);
    const procId = await approvedProcedure(shop);
    const id = (
      await post(shop.s.technician, '/safety/lockouts', {
        procedureId: procId,
        reason: 'Replace the punch head clamp',
        points: lockPoints('ST'),
        password: PASSWORD,
      }).expect(201)
    ).body.id;
    const s = await station();
    // The holder is named so the operator knows whom to ask before the machine is run again.
    expect(s.lockouts).toEqual([
      expect.objectContaining({
        id,
        machineCode: 'C1',
        state: 'locked',
        reason: 'Replace the punch head clamp',
        heldBy: expect.stringMatching(/^technician of /),
      }),
    ]);
    // Locking out the cell locks out its components too.
    expect((await station(shop.s.operator, 'C1-PH')).lockouts.map((l: { id: string }) => l.id)).toEqual([id]);
    const table = (await get(shop.s.operator, '/stations/PT1').expect(200)).body;
    expect(table.lockouts).toEqual([]);
    expect((await station(other.s.operator)).lockouts).toEqual([]);
  });
});
