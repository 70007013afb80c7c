import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { makeShop, makeTestApp, signIn, type TestShop } from '../setup/test-app';
import { ActivityEvent } from '../../server/modules/activity-log/activity-event.entity';
import { recordActivity } from '../../server/modules/activity-log/activity-log.service';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let a: TestShop;
let b: TestShop;

beforeAll(async () => {
  t = await makeTestApp();
  a = await makeShop(t.em(), 'iso-a');
  b = await makeShop(t.em(), 'iso-b');
  const em = t.em();
  recordActivity(em, { orgId: b.orgId, userId: b.users.admin.userId }, 'test.secret-of-b', { type: 'Test', id: 'b' });
  await em.flush();
});
afterAll(() => t.close());

describe('shop isolation', () => {
  it("answers 404 when an admin changes another shop's member", async () => {
    const { agent, csrf } = await signIn(t.app, a.users.admin.email);
    const res = await agent.patch(`/api/users/${b.users.operator.membershipId}`).set('X-CSRF-Token', csrf).send({ role: 'admin' }).expect(404);
    expect(res.body.message).toBe('Member not found');
  });

  it("lists only the signed-in shop's members", async () => {
    const { agent } = await signIn(t.app, a.users.admin.email);
    const res = await agent.get('/api/users?pageSize=200').expect(200);
    const emails = res.body.rows.map((r: { email: string }) => r.email);
    expect(emails).toContain(a.users.operator.email);
    expect(emails.some((e: string) => e.endsWith(`@${b.slug}.example`))).toBe(false);
  });

  it("never returns another shop's audit events", async () => {
    const { agent } = await signIn(t.app, a.users.safety.email);
    const res = await agent.get('/api/audit-events?action=test.secret-of-b').expect(200);
    expect(res.body.total).toBe(0);
    const own = await signIn(t.app, b.users.safety.email);
    const mine = await own.agent.get('/api/audit-events?action=test.secret-of-b').expect(200);
    expect(mine.body.total).toBe(1);
  });

  it('refuses a scoped query made without a shop (the filter has no default)', async () => {
    await expect(t.em().find(ActivityEvent, {})).rejects.toThrow(/No arguments provided for filter/);
  });
});

describe('site settings', () => {
  it('lets the admin rename the shop and change its time zone, refusing an unknown zone on its field', async () => {
    const { agent, csrf } = await signIn(t.app, a.users.admin.email);
    const bad = await agent.patch('/api/organization').set('X-CSRF-Token', csrf).send({ name: 'Renamed shop', timeZone: 'Mars/Olympus' }).expect(400);
    expect(bad.body.fields).toEqual([{ path: 'timeZone', message: 'Not a known time zone: use an IANA name such as America/Chicago' }]);
    const ok = await agent.patch('/api/organization').set('X-CSRF-Token', csrf).send({ name: 'Renamed shop', timeZone: 'Europe/Berlin' }).expect(200);
    expect(ok.body).toMatchObject({ name: 'Renamed shop', timeZone: 'Europe/Berlin' });
    const me = await agent.get('/api/me').expect(200);
    expect(me.body.organization).toMatchObject({ name: 'Renamed shop', timeZone: 'Europe/Berlin' });
    // The other shop is untouched.
    const other = await signIn(t.app, b.users.admin.email);
    expect((await other.agent.get('/api/organization').expect(200)).body.name).not.toBe('Renamed shop');
  });
});
