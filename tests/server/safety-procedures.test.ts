import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { writeFileSync } from 'node:fs';
import { deflateSync } from 'node:zlib';
import { makeTestApp } from '../setup/test-app';
import { readPdf } from '../setup/pdf';
import { approvedProcedure, cellProcedure, countSignOffs, get, makeSafetyShop, PASSWORD, post, put, type SafetyShop } from './safety-helpers';
import { WORK_CAUTION } from '../../shared/domain/cautions';
import { nextPointTag, pointTag } from '../../shared/schemas/safety-procedures';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let shop: SafetyShop;
let other: SafetyShop;
beforeAll(async () => {
  t = await makeTestApp();
  shop = await makeSafetyShop(t.app, t.em(), 'proc');
  other = await makeSafetyShop(t.app, t.em(), 'proc-other');
});
afterAll(() => t.close());

/** A real, tiny PNG (one grey pixel), so the content check has something genuine to accept. */
function png(): Buffer {
  const crcTable = Array.from({ length: 256 }, (_, n) => {
    let c = n;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    return c >>> 0;
  });
  const crc = (b: Buffer) => {
    let c = 0xffffffff;
    for (const x of b) c = crcTable[(c ^ x) & 0xff] ^ (c >>> 8);
    return (c ^ 0xffffffff) >>> 0;
  };
  const chunk = (type: string, data: Buffer) => {
    const len = Buffer.alloc(4);
    len.writeUInt32BE(data.length);
    const td = Buffer.concat([Buffer.from(type), data]);
    const c = Buffer.alloc(4);
    c.writeUInt32BE(crc(td));
    return Buffer.concat([len, td, c]);
  };
  const ihdr = Buffer.from([0, 0, 0, 1, 0, 0, 0, 1, 8, 0, 0, 0, 0]);
  return Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    chunk('IHDR', ihdr),
    chunk('IDAT', deflateSync(Buffer.from([0, 128]))),
    chunk('IEND', Buffer.alloc(0)),
  ]);
}

describe('energy-control procedures', () => {
  it('rejects a procedure without the steps of 1910.147(d), naming each missing field', async () => {
    const bad = cellProcedure();
    const res = await post(shop.s.safety, '/safety/procedures', {
      ...bad,
      machineId: shop.machineId,
      steps: { ...bad.steps, relieve: [], verify: [] },
      sources: [bad.sources[0], { ...bad.sources[1], key: 'E1' }],
    }).expect(400);
    const paths = res.body.fields.map((f: { path: string }) => f.path);
    expect(paths).toEqual(expect.arrayContaining(['steps.relieve', 'steps.verify', 'sources.1.key']));
    expect(res.body.fields.find((f: { path: string }) => f.path === 'steps.verify').message).toBe('Verify isolation: add at least one step');
    expect((await get(shop.s.safety, '/safety/procedures').expect(200)).body).toEqual([]);
  });

  it('refuses an isolation-point tag that is also a machine code, and suggests one in the machine-code scheme', async () => {
    const p = cellProcedure();
    // PT1 is the shop's plasma table: a lock tagged "PT1" on cell C1 would read as that machine.
    const res = await post(shop.s.safety, '/safety/procedures', {
      ...p,
      machineId: shop.machineId,
      sources: [p.sources[0], { ...p.sources[1], key: 'PT1' }],
    }).expect(400);
    expect(res.body.fields).toEqual([{ path: 'sources.1.key', message: 'PT1 is also a machine code; use a tag such as C1-E2' }]);
    expect((await get(shop.s.safety, '/safety/procedures').expect(200)).body).toEqual([]);
    expect([pointTag('C2', 1), pointTag('LONGCODE', 3), nextPointTag('C2', ['C2-E1', 'C2-E3'])]).toEqual(['C2-E1', 'E3', 'C2-E2']);
  });

  it('lets technicians and the safety officer write procedures (the safety officer approves), and answers 404 for another shop’s machine', async () => {
    await post(shop.s.operator, '/safety/procedures', { ...cellProcedure(), machineId: shop.machineId }).expect(403);
    await post(shop.s.admin, '/safety/procedures', { ...cellProcedure(), machineId: shop.machineId }).expect(403);
    await post(shop.s.safety, '/safety/procedures', { ...cellProcedure(), machineId: other.machineId }).expect(404);
  });

  it('versions a procedure: drafts change, approval freezes, old versions stay readable', async () => {
    const created = await post(shop.s.technician, '/safety/procedures', { ...cellProcedure('Cell lockout'), machineId: shop.machineId }).expect(201);
    const id = created.body.id;
    // A wrong password writes nothing: the version stays a draft and the chain does not grow.
    const before = await countSignOffs(shop.orgId);
    await post(shop.s.safety, `/safety/procedures/${id}/versions/1/approve`, { password: 'wrong' }).expect(401);
    expect(await countSignOffs(shop.orgId)).toBe(before);
    let detail = await get(shop.s.safety, `/safety/procedures/${id}`).expect(200);
    expect(detail.body.current).toBeNull();
    expect(detail.body.draft).toMatchObject({ version: 1, status: 'draft' });

    const edited = cellProcedure('Cell lockout');
    edited.scope = 'Edited scope before approval.';
    await put(shop.s.technician, `/safety/procedures/${id}/draft`, edited).expect(200);
    const ok = await post(shop.s.safety, `/safety/procedures/${id}/versions/1/approve`, { password: PASSWORD }).expect(201);
    expect(ok.body.version).toBe(1);
    await post(shop.s.safety, `/safety/procedures/${id}/versions/1/approve`, { password: PASSWORD }).expect(409);

    const v2 = cellProcedure('Cell lockout');
    v2.steps.relieve.push('Block the ram with the red safety block.');
    const draft = await put(shop.s.technician, `/safety/procedures/${id}/draft`, v2).expect(200);
    expect(draft.body.version).toBe(2);
    detail = await get(shop.s.safety, `/safety/procedures/${id}`).expect(200);
    expect(detail.body.current).toMatchObject({ version: 1, status: 'approved', approvedByName: `safety of ${shop.slug}` });
    expect(detail.body.current.content.scope).toBe('Edited scope before approval.');
    expect(detail.body.draft.version).toBe(2);

    await post(shop.s.safety, `/safety/procedures/${id}/versions/2/approve`, { password: PASSWORD, retrainingRequired: true }).expect(201);
    detail = await get(shop.s.safety, `/safety/procedures/${id}`).expect(200);
    expect(detail.body.versions.map((v: { version: number; status: string }) => [v.version, v.status])).toEqual([
      [1, 'superseded'],
      [2, 'approved'],
    ]);
    expect(detail.body.current.content.steps.relieve).toHaveLength(2);
    const old = await get(shop.s.safety, `/safety/procedures/${id}?version=1`).expect(200);
    expect(old.body.current).toMatchObject({ version: 1, status: 'superseded' });
    expect(old.body.current.content.steps.relieve).toHaveLength(1);

    // The approval signature names the version and a digest of its text.
    const sig = await get(shop.s.safety, `/safety/sign-offs?meaning=procedure-approved&sort=seq&dir=asc`).expect(200);
    expect(sig.body.rows.map((r: { summary: string }) => r.summary)).toEqual(expect.arrayContaining(['Cell lockout — version 2, replaces version 1']));

    // Another shop sees nothing of it.
    await get(other.s.safety, `/safety/procedures/${id}`).expect(404);
    await get(other.s.operator, `/safety/procedures/${id}/placard.pdf`).expect(404);
  });

  it('takes isolation-point photos checked by their bytes, with a size cap, on drafts only', async () => {
    const id = await approvedProcedure(shop, cellProcedure('Photo procedure'));
    const upload = (buf: Buffer, name: string, key = 'E1') =>
      shop.s.safety.agent
        .post(`/api/safety/procedures/${id}/photos`)
        .set('X-CSRF-Token', shop.s.safety.csrf)
        .field('sourceKey', key)
        .attach('photo', buf, name);
    let res = await upload(png(), 'q0.png');
    expect(res.status).toBe(409); // approved versions do not change
    await put(shop.s.technician, `/safety/procedures/${id}/draft`, cellProcedure('Photo procedure')).expect(200);
    res = await upload(Buffer.from('just some text, not an image'), 'fake.png').expect(400);
    expect(res.body.fields).toEqual([{ path: 'photo', message: 'Only JPEG, PNG or WebP photos are accepted (this file is not an image)' }]);
    res = await upload(Buffer.concat([png(), Buffer.alloc(5 * 1024 * 1024)]), 'huge.png').expect(413);
    expect(res.body.fields[0]).toEqual({ path: 'photo', message: 'The photo is larger than 5 MB' });
    res = await upload(png(), 'q0.png', 'X9').expect(400);
    expect(res.body.fields[0].path).toBe('sourceKey');
    res = await upload(png(), 'q0.png').expect(201);
    const photo = await get(shop.s.operator, `/safety/procedures/${id}/photos/${res.body.id}`).expect(200);
    expect(photo.headers['content-type']).toBe('image/png');
    expect(Buffer.compare(photo.body as Buffer, png())).toBe(0);
    await post(shop.s.safety, `/safety/procedures/${id}/versions/2/approve`, { password: PASSWORD, retrainingRequired: false }).expect(201);
    const detail = await get(shop.s.safety, `/safety/procedures/${id}`).expect(200);
    expect(detail.body.current.photos).toHaveLength(1);
    expect(detail.body.current.retrainingRequired).toBe(false);
  });

  it('prints a placard PDF of the approved version with its steps and the caution', async () => {
    const id = await approvedProcedure(shop, cellProcedure('Placard procedure'));
    const res = await shop.s.operator.agent
      .get(`/api/safety/procedures/${id}/placard.pdf`)
      .buffer(true)
      .parse((r, cb) => {
        const chunks: Buffer[] = [];
        r.on('data', (c: Buffer) => chunks.push(c));
        r.on('end', () => cb(null, Buffer.concat(chunks)));
      });
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/pdf');
    const pdf = await readPdf(res.body as Buffer);
    const text = pdf.text;
    expect(text.replace(/\s+/g, ' ')).toContain('ISOLATE ALL ENERGY BEFORE YOU WORK HERE');
    expect(text).toContain('C1');
    expect(text).toContain('Main disconnect Q0');
    // The six phases of OSHA 29 CFR 1910.147(d), in order.
    const order = [
      'Prepare for shutdown',
      'Shut the machine down',
      'Isolate every energy source',
      'Apply locks and tags',
      'Relieve stored energy',
      'Verify isolation',
    ].map((h) => text.indexOf(h));
    expect(order.every((i) => i >= 0)).toBe(true);
    expect([...order].sort((a, b) => a - b)).toEqual(order);
    expect(text.replace(/\s+/g, ' ')).toContain(WORK_CAUTION.slice(0, 60).replace(/’/g, '’'));
    // One sheet at the machine, printed time in the shop's zone (named), the machine name once.
    expect(pdf.pages).toBe(1);
    expect(text).toMatch(/printed \d{1,2} [A-Z][a-z]{2} \d{4}, \d\d:\d\d \(America\/Chicago\)/);
    expect(text).not.toContain('UTC');
    expect(text.split('Cell 1').length - 1).toBe(1);
    expect(pdf.firstPagePng.length).toBeGreaterThan(10_000); // a page with ink on it, not a blank sheet
    if (process.env.KEEP_PDF) writeFileSync(process.env.KEEP_PDF, res.body as Buffer);
  });
});
