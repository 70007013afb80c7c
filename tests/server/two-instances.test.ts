// Two server processes on different loopback ports against one database, as behind a load
// balancer: a session begun on one continues on the other (sessions live in PostgreSQL), and the
// scheduled pass runs on one instance at a time (PostgreSQL advisory lock).
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import supertest from 'supertest';
import { makeShop, makeTestApp, type TestShop } from '../setup/test-app';
import { makeMachine, planBody } from './work-orders-fixtures';
import { superuser } from './safety-helpers';
import { sleep, startServer, type ServerProcess } from './server-process';
import { LOCKS } from '../../server/jobs/advisory-lock';
import { DEMO_PASSWORD } from '../../seed/factories';
import pg from 'pg';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let shop: TestShop;
let machineId: string;
let a: ServerProcess;
let b: ServerProcess;
// Both instances try a pass every 2 seconds, so they compete for the lock all the time.
const env = { DATABASE_URL: process.env.DATABASE_URL!, JOB_SCHEDULE: '*/2 * * * * *', LOG_LEVEL: 'info' };

beforeAll(async () => {
  t = await makeTestApp();
  shop = await makeShop(t.em(), 'two');
  machineId = await makeMachine(t.em(), shop.orgId, 'HU1');
  [a, b] = await Promise.all([startServer(env), startServer(env)]);
}, 240_000);
afterAll(async () => {
  await Promise.all([a?.stop(), b?.stop()]);
  await t.close();
});

async function jobRuns(orgId: string, since = new Date(0)) {
  const c = new pg.Client({ connectionString: process.env.DATABASE_URL });
  await c.connect();
  try {
    const r = await c.query(
      `select pass_id, min(started_at) as started, max(finished_at) as finished from job_run
      where organization_id = $1 and started_at > $2 group by pass_id order by 2`,
      [orgId, since],
    );
    return r.rows as { pass_id: string; started: Date; finished: Date }[];
  } finally {
    await c.end();
  }
}

async function waitFor<T>(what: string, fn: () => Promise<T | null | undefined | false>, timeoutMs = 90_000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const v = await fn();
    if (v) return v;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await sleep(250);
  }
}

describe('two instances against one database', () => {
  it('a session signed in on one instance continues on the other, and signing out ends it on both', async () => {
    const onA = supertest.agent(a.url);
    const csrf = (await onA.get('/api/auth/csrf').expect(200)).body.token;
    const login = await onA.post('/api/auth/login').set('X-CSRF-Token', csrf).send({ email: shop.users.admin.email, password: DEMO_PASSWORD }).expect(200);
    const cookie = login.headers['set-cookie'] as unknown as string[];
    const token = login.body.csrfToken as string;
    expect(a.port).not.toBe(b.port);

    const onB = supertest(b.url);
    const me = await onB.get('/api/me').set('Cookie', cookie).expect(200);
    expect(JSON.stringify(me.body)).toContain(shop.users.admin.email);
    // A change on B with the CSRF token A handed out; A sees it.
    const plan = await onB
      .post('/api/plans')
      .set('Cookie', cookie)
      .set('X-CSRF-Token', token)
      .send(planBody(machineId, { title: 'Filter change (two instances)' }))
      .expect(201);
    const listed = await onA.get('/api/plans').expect(200);
    expect(JSON.stringify(listed.body)).toContain(plan.body.id);

    await onB
      .post('/api/auth/logout')
      .set('Cookie', cookie)
      .set('X-CSRF-Token', token)
      .expect((r) => expect(r.status).toBeLessThan(300));
    await onA.get('/api/me').expect(401);
  });

  it('runs the scheduled pass on one instance at a time (advisory lock)', async () => {
    // The plan above gives the pass a job run row per pass for this shop.
    await waitFor('two scheduled passes', async () => (await jobRuns(shop.orgId)).length >= 2);

    // Hold the pass's lock as another holder would: both instances must skip their ticks.
    const su = await superuser();
    let heldFrom: Date;
    let heldTo: Date;
    try {
      await su.query('select pg_advisory_lock($1)', [LOCKS.scheduledPass]);
      heldFrom = (await su.query('select now() as t')).rows[0].t;
      const skipped = (s: ServerProcess) => s.output().split('another instance holds the lock').length - 1;
      const [skA, skB] = [skipped(a), skipped(b)];
      await waitFor('both instances to skip a tick', async () => skipped(a) > skA && skipped(b) > skB, 30_000);
      heldTo = (await su.query('select now() as t')).rows[0].t;
    } finally {
      await su.query('select pg_advisory_unlock_all()');
      await su.end();
    }
    expect(await jobRuns(shop.orgId, heldFrom)).toEqual([]); // nothing ran while the lock was held
    const after = await waitFor('a pass after the lock is free', async () => {
      const runs = await jobRuns(shop.orgId, heldTo);
      return runs.length >= 2 && runs;
    });
    expect(after.length).toBeGreaterThanOrEqual(2);

    // Passes never overlap in time, whichever instance ran them.
    const all = await jobRuns(shop.orgId);
    expect(new Set(all.map((r) => r.pass_id)).size).toBe(all.length);
    for (let i = 1; i < all.length; i++) expect(new Date(all[i].started).getTime()).toBeGreaterThanOrEqual(new Date(all[i - 1].finished).getTime());
    expect(a.alive() && b.alive()).toBe(true);
  }, 180_000);
});
