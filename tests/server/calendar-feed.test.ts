import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import supertest from 'supertest';
import type { MikroORM } from '@mikro-orm/postgresql';
import { makeShop, makeTestApp, signIn, type SignedIn, type TestShop } from '../setup/test-app';
import { initORM } from '../../server/db';
import { runDueEngine } from '../../server/jobs/due-engine';
import { CalendarFeed } from '../../server/modules/calendar-feed/calendar-feed.entity';
import { del, get, makeMachine, planBody, post, scoped } from './work-orders-fixtures';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let orm: MikroORM;
let a: TestShop;
let admin: SignedIn;
let tech: SignedIn;

beforeAll(async () => {
  t = await makeTestApp();
  orm = await initORM();
  a = await makeShop(t.em(), 'ics');
  admin = await signIn(t.app, a.users.admin.email);
  tech = await signIn(t.app, a.users.technician.email);
  const unit = await makeMachine(scoped(t.em(), a.orgId), a.orgId, 'FX1', 'fume-extractor');
  const plan = await post(
    admin,
    '/plans',
    planBody(unit, { title: 'Empty dust bin', estimatedMinutes: 20, triggers: [{ kind: 'calendar-floating', every: 1, unit: 'week' }] }),
  ).expect(201);
  await orm.em.fork().execute(`update maintenance_plan set started_at = ?, recheck_at = null where id = ?`, [new Date('2026-04-01T12:00:00Z'), plan.body.id]);
  await runDueEngine(orm, new Date('2026-04-08T13:00:00Z'), { appUrl: t.config.APP_URL, orgId: a.orgId });
});
afterAll(() => t.close());

const fetchFeed = (url: string) => supertest(t.app).get(new URL(url).pathname);

describe('private calendar feed', () => {
  it('gives a private URL once, stores only a hash, and serves RFC 5545 text of the person’s due work', async () => {
    const made = await post(tech, '/calendar-feed').expect(201);
    expect(made.body.url).toMatch(/\/api\/calendar\/[A-Za-z0-9_-]{43}\.ics$/);
    const token = made.body.url.split('/').pop().replace('.ics', '');
    const stored = await orm.em.fork().find(CalendarFeed, { user: a.users.technician.userId }, { filters: false });
    expect(stored.map((f) => f.tokenHash)).not.toContain(token);
    expect(stored[0].tokenHash).toMatch(/^[0-9a-f]{64}$/);

    const res = await fetchFeed(made.body.url).expect(200);
    expect(res.headers['content-type']).toBe('text/calendar; charset=utf-8');
    const text = res.text;
    // RFC 5545 §3.4 / §3.6.1: a VCALENDAR with VERSION and PRODID, one VEVENT per work order, CRLF line ends.
    expect(text.startsWith('BEGIN:VCALENDAR\r\n')).toBe(true);
    expect(text).toContain('VERSION:2.0');
    expect(text).toMatch(/PRODID:-\/\/Kerfbook\/\/due-work\/\/EN/);
    expect(text).toMatch(/SUMMARY:(\[PAST DUE\] )?WO \d+: Empty dust bin \(FX1\)/);
    expect(text).toMatch(/DTSTART(;TZID=America\/Chicago)?:20260408T/);
    expect(text).toContain('Safety: Before you work on a machine');
    const status = await get(tech, '/calendar-feed').expect(200);
    expect(status.body).toMatchObject({ active: true, url: null });
    expect(status.body.lastUsedAt).not.toBeNull();

    // Another person's feed shows their own work only (the admin has none here).
    const adminFeed = await post(admin, '/calendar-feed').expect(201);
    expect((await fetchFeed(adminFeed.body.url).expect(200)).text).not.toContain('BEGIN:VEVENT');
  });

  it('answers 404 for a revoked, replaced or unknown token', async () => {
    const first = await post(tech, '/calendar-feed').expect(201);
    const second = await post(tech, '/calendar-feed').expect(201);
    await fetchFeed(first.body.url).expect(404); // replaced
    await fetchFeed(second.body.url).expect(200);
    await del(tech, '/calendar-feed').expect(200);
    await fetchFeed(second.body.url).expect(404);
    await supertest(t.app).get('/api/calendar/AAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAA.ics').expect(404);
    await supertest(t.app).get('/api/calendar/short').expect(404);
    expect((await get(tech, '/calendar-feed').expect(200)).body.active).toBe(false);
  });
});
