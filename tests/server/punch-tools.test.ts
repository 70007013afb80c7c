import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { makeShop, makeTestApp, post, signIn, type SignedIn, type TestShop } from '../setup/test-app';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let a: TestShop;
let b: TestShop;
let tech: SignedIn;
let op: SignedIn;
let head: string;
let hits: string;
let tool: string;

const hoursAgo = (h: number) => new Date(Date.now() - h * 3600_000).toISOString();

beforeAll(async () => {
  t = await makeTestApp();
  a = await makeShop(t.em(), 'tool-a');
  b = await makeShop(t.em(), 'tool-b');
  tech = await signIn(t.app, a.users.technician.email);
  op = await signIn(t.app, a.users.operator.email);
  head = (await post(tech, '/machines', { code: 'C1-P', name: 'Punch head', kind: 'punch-head' }).expect(201)).body.id;
  hits = (await post(tech, '/meters', { machineId: head, code: 'punch-hits', name: 'Punch hits', kind: 'count', unit: 'hits' }).expect(201)).body.id;
  await post(op, `/meters/${hits}/readings`, { value: 50_000, readAt: hoursAgo(30) }).expect(201);
});
afterAll(() => t.close());

describe('punch tools', () => {
  it('creates a tool counting hits from the head’s meter as of now, and refuses a meter that does not count hits', async () => {
    const starts = (await post(tech, '/meters', { machineId: head, code: 'odd', name: 'Odd count', kind: 'count', unit: 'cycles' }).expect(201)).body.id;
    const bad = await post(tech, '/punch-tools', {
      machineId: head,
      hitsMeterId: starts,
      code: 'T01',
      name: 'Round 12',
      stationSize: 'B',
      sharpeningIntervalHits: 1000,
    }).expect(400);
    expect(bad.body.fields[0]).toEqual({ path: 'hitsMeterId', message: 'Odd count counts cycles, not hits' });
    const badSize = await post(tech, '/punch-tools', {
      machineId: head,
      hitsMeterId: hits,
      code: 'T01',
      name: 'Round 12',
      stationSize: 'Z',
      sharpeningIntervalHits: 10,
    }).expect(400);
    expect(badSize.body.fields.map((f: { path: string }) => f.path).sort()).toEqual(['sharpeningIntervalHits', 'stationSize']);
    tool = (
      await post(tech, '/punch-tools', {
        machineId: head,
        hitsMeterId: hits,
        code: 'T01',
        name: 'Round 12',
        stationSize: 'B',
        sharpeningIntervalHits: 1000,
      }).expect(201)
    ).body.id;
    await post(op, '/punch-tools', { machineId: head, hitsMeterId: hits, code: 'T02', name: 'Square', stationSize: 'C', sharpeningIntervalHits: 1000 }).expect(
      403,
    );
  });

  it('counts hits since the last sharpening and raises attention at the interval', async () => {
    await post(op, `/meters/${hits}/readings`, { value: 50_600 }).expect(201);
    let [row] = (await op.agent.get(`/api/punch-tools?machineId=${head}`).expect(200)).body;
    expect(row).toMatchObject({ code: 'T01', hitsSince: 600, fraction: 0.6, due: false });
    await post(op, `/meters/${hits}/readings`, { value: 51_000 }).expect(201);
    [row] = (await op.agent.get(`/api/punch-tools?machineId=${head}`).expect(200)).body;
    expect(row).toMatchObject({ hitsSince: 1000, due: true });
  });

  it('records a sharpening that ends the run and starts the count again', async () => {
    const res = await post(tech, `/punch-tools/${tool}/sharpenings`, { removedMm: 0.15, note: 'Edge chipped' }).expect(201);
    expect(res.body.hitsSincePrevious).toBe(1000);
    const [row] = (await op.agent.get(`/api/punch-tools?machineId=${head}`).expect(200)).body;
    expect(row).toMatchObject({ hitsSince: 0, due: false, sharpenings: 1 });
    const list = await op.agent.get(`/api/punch-tools/${tool}/sharpenings`).expect(200);
    expect(list.body[0]).toMatchObject({ hitsReading: 51_000, hitsSincePrevious: 1000, removedMm: 0.15, by: `technician of ${a.slug}` });
    const early = await post(tech, `/punch-tools/${tool}/sharpenings`, { sharpenedAt: hoursAgo(48) }).expect(400);
    expect(early.body.fields[0].path).toBe('sharpenedAt');
    await post(tech, `/punch-tools/${tool}/sharpenings`, { removedMm: 9 }).expect(400);
  });

  it("keeps another shop's tools out of reach", async () => {
    const other = await signIn(t.app, b.users.technician.email);
    await post(other, `/punch-tools/${tool}/sharpenings`, {}).expect(404);
    expect((await other.agent.get('/api/punch-tools').expect(200)).body).toEqual([]);
  });
});
