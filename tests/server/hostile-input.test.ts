import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { gzipSync } from 'node:zlib';
import { get, makeShop, makeTestApp, patch, post, signIn, type SignedIn, type TestShop } from '../setup/test-app';
import { Machine } from '../../server/modules/machines/machine.entity';
import { Meter } from '../../server/modules/meters/meter.entity';

// Whatever a client sends, the answer is a 4xx that says what is wrong, never a 500.
let t: Awaited<ReturnType<typeof makeTestApp>>;
let shop: TestShop;
let admin: SignedIn;
let tech: SignedIn;
let safety: SignedIn;
let machineId: string;
let hydraulicId: string;
let meterId: string;
let workOrderId: string;

beforeAll(async () => {
  t = await makeTestApp();
  shop = await makeShop(t.em(), 'hostile');
  const em = t.em();
  const cell = em.create(Machine, { organization: shop.orgId, kind: 'punch-plasma-cell', code: 'C1', name: 'Cell 1', active: true });
  const unit = em.create(Machine, { organization: shop.orgId, kind: 'hydraulic-unit', code: 'HU1', name: 'Hydraulic unit', active: true });
  const meter = em.create(Meter, { organization: shop.orgId, machine: cell, code: 'hits', name: 'Punch hits', kind: 'count', unit: 'hits' });
  await em.flush();
  machineId = cell.id;
  hydraulicId = unit.id;
  meterId = meter.id;
  admin = await signIn(t.app, shop.users.admin.email);
  tech = await signIn(t.app, shop.users.technician.email);
  safety = await signIn(t.app, shop.users.safety.email);
  const wo = await post(tech, '/work-orders', { machineId, title: 'Check the clamps' }).expect(201);
  workOrderId = wo.body.id;
});
afterAll(() => t.close());

const NUL = 'a\u0000b';
const LONE_SURROGATE = 'a\uD800b';

/** A 4xx with a message, and when a field is named, that field. */
function refused(res: { status: number; body: { message?: string; fields?: { path: string }[] } }, status: number, field?: string) {
  expect(res.status, JSON.stringify(res.body)).toBe(status);
  expect(res.body.message).toBeTruthy();
  if (field) expect(res.body.fields?.map((f) => f.path)).toContain(field);
}

describe('text that cannot be stored or shown on one line', () => {
  it('refuses NUL, lone surrogates and control characters in one-line names, titles and codes', async () => {
    for (const bad of [NUL, LONE_SURROGATE, 'Cell\r\nBcc: x@y.example', 'tab\there', 'bell\u0007', 'c1\u0085']) {
      refused(await post(admin, '/machines', { code: 'C9', name: `Cell ${bad}`, kind: 'plasma-table' }), 400, 'name');
      refused(await post(admin, '/users', { name: `Person ${bad}`, email: `p-${shop.slug}@x.example`, role: 'operator' }), 400, 'name');
      refused(await post(tech, '/work-orders', { machineId, title: `Leak ${bad}` }), 400, 'title');
      refused(await post(tech, '/part-types', { partNumber: 'N-1', name: `Nozzle ${bad}`, category: 'consumable', leadTimeDays: 3 }), 400, 'name');
      refused(await post(safety, '/safety/procedures', { title: `Lockout ${bad}`, machineId }), 400, 'title');
    }
  });

  it('refuses hidden text-direction characters in one-line text, saying which characters', async () => {
    // Unicode Standard Annex #9, table 1: embeddings/overrides U+202A–U+202E, isolates U+2066–U+2069.
    for (const cp of [0x202a, 0x202b, 0x202c, 0x202d, 0x202e, 0x2066, 0x2067, 0x2068, 0x2069]) {
      const bad = String.fromCodePoint(cp);
      const res = await post(admin, '/machines', { code: 'C8', name: `Cell ${bad}exe.txt`, kind: 'plasma-table' });
      refused(res, 400, 'name');
      expect(res.body.fields.find((f: { path: string }) => f.path === 'name').message).toMatch(
        /text-direction character \(U\+202A–U\+202E or U\+2066–U\+2069\)/,
      );
      refused(await post(tech, '/work-orders', { machineId, title: `Leak ${bad}` }), 400, 'title');
      refused(await post(safety, '/safety/procedures', { title: `Lockout ${bad}`, machineId }), 400, 'title');
    }
    // Right-to-left letters themselves are text, not controls, and are kept.
    await post(tech, '/work-orders', { machineId, title: 'Leak \u05d0\u05d1 at the valve' }).expect(201);
  });

  it('refuses NUL and lone surrogates in multi-line text, but keeps line breaks', async () => {
    refused(await patch(tech, `/work-orders/${workOrderId}`, { notes: `Found ${NUL}` }), 400, 'notes');
    refused(await patch(tech, `/work-orders/${workOrderId}`, { notes: `Found ${LONE_SURROGATE}` }), 400, 'notes');
    refused(await post(tech, '/work-orders', { machineId, title: 'Worn nozzle', instructions: `Swap ${NUL}` }), 400, 'instructions');
    refused(await post(tech, `/meters/${meterId}/readings`, { value: 5, note: `x${NUL}` }), 400, 'note');
    refused(await post(tech, `/work-orders/${workOrderId}/close`, { notes: `done ${NUL}` }), 400, 'notes');
    await patch(tech, `/work-orders/${workOrderId}`, { notes: 'Line one\nLine two\ttabbed 🔧' }).expect(200);
  });
});

describe('dates', () => {
  it('refuses years outside 1900–2200 wherever a date is accepted', async () => {
    for (const at of ['0000-01-01T00:00:00Z', '0001-01-01T00:00:00Z', '1899-12-31T23:00:00Z', '9999-12-31T23:59:59Z']) {
      refused(await post(tech, `/meters/${meterId}/readings`, { value: 7, readAt: at }), 400, 'readAt');
      refused(await post(tech, '/work-orders', { machineId, title: 'Far away', dueAt: at }), 400, 'dueAt');
      refused(await patch(tech, `/work-orders/${workOrderId}`, { dueAt: at }), 400, 'dueAt');
      refused(await post(tech, '/oil-analyses', { machineId: hydraulicId, sampledAt: at, ge4um: 100, ge6um: 50, ge14um: 10 }), 400, 'sampledAt');
    }
    refused(await get(safety, '/safety/sign-offs?from=0000-01-01'), 400, 'from');
    refused(await get(safety, '/safety/sign-offs?to=9999-12-31'), 400, 'to');
    refused(
      await post(safety, '/safety/training', { userId: shop.users.technician.userId, topic: 'lockout', trainedOn: '0000-01-01', password: 'kerfbook-demo' }),
      400,
      'trainedOn',
    );
  });
});

describe('bodies the parser cannot read', () => {
  const raw = (s: SignedIn, url: string) => s.agent.post(`/api${url}`).set('X-CSRF-Token', s.csrf);

  it('answers bad JSON, an unknown charset or encoding, and a body too large with 400, 415 and 413', async () => {
    refused(await raw(tech, '/work-orders').set('Content-Type', 'application/json').send('{"title": '), 400);
    refused(await raw(tech, '/work-orders').set('Content-Type', 'application/json; charset=klingon').send('{}'), 415);
    refused(await raw(tech, '/work-orders').set('Content-Type', 'application/json').set('Content-Encoding', 'rot13').send('{}'), 415);
    refused(await raw(tech, '/work-orders').set('Content-Type', 'application/json').set('Content-Encoding', 'gzip').send('not gzip at all'), 400);
    const big = JSON.stringify({ machineId, title: 'x'.repeat(2 * 1024 * 1024) });
    refused(await raw(tech, '/work-orders').set('Content-Type', 'application/json').send(big), 413);
    // Sent as the bytes they are (superagent would otherwise write a Buffer as JSON).
    const asIs = (b: unknown) => b as string;
    const bomb = gzipSync(Buffer.from(JSON.stringify({ title: 'y'.repeat(4 * 1024 * 1024) })));
    refused(await raw(tech, '/work-orders').set('Content-Type', 'application/json').set('Content-Encoding', 'gzip').serialize(asIs).send(bomb), 413);
  });

  it('answers broken multipart uploads with 400 and the wrong kind of body with 415', async () => {
    const broken = '--XYZ\r\nContent-Disposition: form-data; name="file"; filename="a.csv"\r\nContent-Type: text/csv\r\n\r\nmachine_code';
    refused(await raw(tech, '/counter-import/preview').set('Content-Type', 'multipart/form-data; boundary=XYZ').send(broken), 400);
    refused(
      await raw(admin, `/machines/${machineId}/photos`).set('Content-Type', 'multipart/form-data; boundary=XYZ').send(broken.replace('"file"', '"photo"')),
      400,
    );
    refused(await raw(tech, `/work-orders/${workOrderId}/attachments`).set('Content-Type', 'multipart/form-data').send('--'), 400);
    refused(await raw(tech, '/counter-import/preview').set('Content-Type', 'application/json').send('{"file": "machine_code"}'), 415);
  });

  it('answers a path with bad percent-encoding with 400', async () => {
    for (const path of ['/api/machines/%E0%A4%A', '/api/work-orders/%ZZ', '/api/meters/%C0%80/trend']) {
      const res = await admin.agent.get(path);
      expect(res.status, `${path}: ${JSON.stringify(res.body)}`).toBe(400);
      expect(res.body.message).toMatch(/percent-encoded|not valid|encoding/i);
    }
  });
});
