import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { makeShop, makeTestApp, signIn, type SignedIn, type TestShop } from '../setup/test-app';
import { MachinePhoto } from '../../server/modules/machines/machine-photo.entity';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let a: TestShop;
let b: TestShop;
let tech: SignedIn;
let op: SignedIn;
let otherTech: SignedIn;
let machine: string;

// A 1×1 PNG.
const PNG = Buffer.from('iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNk+M9QDwADhgGAWjR9awAAAABJRU5ErkJggg==', 'base64');

const photoCount = async (orgId: string) => t.em().fork().count(MachinePhoto, { organization: orgId }, { filters: false });
const upload = (s: SignedIn, id: string, file: Buffer, filename: string, caption?: string) => {
  const req = s.agent.post(`/api/machines/${id}/photos`).set('X-CSRF-Token', s.csrf);
  if (caption !== undefined) req.field('caption', caption);
  return req.attach('photo', file, { filename, contentType: 'image/png' });
};

beforeAll(async () => {
  t = await makeTestApp();
  a = await makeShop(t.em(), 'mphoto-a');
  b = await makeShop(t.em(), 'mphoto-b');
  tech = await signIn(t.app, a.users.technician.email);
  op = await signIn(t.app, a.users.operator.email);
  otherTech = await signIn(t.app, b.users.technician.email);
  const res = await tech.agent
    .post('/api/machines')
    .set('X-CSRF-Token', tech.csrf)
    .send({ code: 'P1', name: 'Plasma table 1', kind: 'plasma-table' })
    .expect(201);
  machine = res.body.id;
});
afterAll(() => t.close());

describe('machine photos', () => {
  let photoId: string;

  it('stores a photo checked by content; everyone who reads machines can list and view it', async () => {
    const res = await upload(tech, machine, PNG, 'nameplate.png', 'Nameplate').expect(201);
    photoId = res.body.id;
    const list = await op.agent.get(`/api/machines/${machine}/photos`).expect(200);
    expect(list.body).toMatchObject([{ id: photoId, caption: 'Nameplate', mimeType: 'image/png', byteSize: PNG.length }]);
    const img = await op.agent.get(`/api/machines/${machine}/photos/${photoId}`).expect(200);
    expect(img.headers['content-type']).toBe('image/png');
    expect(Buffer.compare(img.body as Buffer, PNG)).toBe(0);
  });

  it('refuses a file that is not an image, naming the problem, and writes nothing', async () => {
    const before = await photoCount(a.orgId);
    const res = await upload(tech, machine, Buffer.from('%PDF-1.4 pretending to be a photo'), 'fake.png').expect(400);
    expect(res.body.fields[0].path).toBe('photo');
    expect(res.body.message).toBe('The file is not a JPEG, PNG or WebP image (it looks like application/pdf)');
    expect(await photoCount(a.orgId)).toBe(before);
  });

  it('refuses a photo larger than 8 MB and writes nothing', async () => {
    const before = await photoCount(a.orgId);
    const res = await upload(tech, machine, Buffer.concat([PNG, Buffer.alloc(8 * 1024 * 1024)]), 'huge.png').expect(413);
    expect(res.body.message).toMatch(/larger than 8 MB/);
    expect(await photoCount(a.orgId)).toBe(before);
  });

  it('lets operators view but not upload or delete', async () => {
    await upload(op, machine, PNG, 'x.png').expect(403);
    await op.agent.delete(`/api/machines/${machine}/photos/${photoId}`).set('X-CSRF-Token', op.csrf).expect(403);
  });

  it("answers 404 for another shop's machine and photo", async () => {
    const before = await photoCount(a.orgId);
    await upload(otherTech, machine, PNG, 'x.png').expect(404);
    await otherTech.agent.get(`/api/machines/${machine}/photos`).expect(404);
    await otherTech.agent.get(`/api/machines/${machine}/photos/${photoId}`).expect(404);
    await otherTech.agent.delete(`/api/machines/${machine}/photos/${photoId}`).set('X-CSRF-Token', otherTech.csrf).expect(404);
    expect(await photoCount(a.orgId)).toBe(before);
    expect(await photoCount(b.orgId)).toBe(0);
  });

  it('deletes a photo', async () => {
    await tech.agent.delete(`/api/machines/${machine}/photos/${photoId}`).set('X-CSRF-Token', tech.csrf).expect(200);
    await op.agent.get(`/api/machines/${machine}/photos/${photoId}`).expect(404);
    const list = await op.agent.get(`/api/machines/${machine}/photos`).expect(200);
    expect(list.body).toEqual([]);
  });
});
