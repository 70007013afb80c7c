// PostgreSQL drops the server's connections (pg_terminate_backend, as a failover or an
// administrator does): requests in flight get a clear 503, never a 500; the process stays up
// and the next requests succeed on fresh connections. SIGTERM lets in-flight requests finish.
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import type pg from 'pg';
import { get, makeShop, makeTestApp, signIn, type TestShop } from '../setup/test-app';
import { superuser } from './safety-helpers';
import { signInAt, sleep, startServer, terminateAppBackends, type ServerProcess } from './server-process';
import { isDatabaseUnavailable } from '../../server/db-faults';
import { Machine } from '../../server/modules/machines/machine.entity';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let shop: TestShop;
beforeAll(async () => {
  t = await makeTestApp();
  const em = t.em();
  shop = await makeShop(em, 'faults');
  em.create(Machine, { organization: shop.orgId, kind: 'plasma-table', code: 'F1', name: 'Fault-test table', active: true });
  await em.flush();
});
afterAll(() => t.close());

/** Every answer is either the normal one or a 503 naming the database; none is a 500. */
function expectOkOrUnavailable(responses: { status: number; body: { error?: string; message?: string } }[]) {
  for (const r of responses) {
    if (r.status === 503) {
      expect(r.body.error).toBe('database_unavailable');
      expect(r.body.message).toMatch(/database is unavailable/i);
    } else expect(r.status).toBe(200);
  }
}

describe('connections dropped under a running app (in-process)', () => {
  it('answers 200 or 503 while its connections are terminated mid-request, then serves again', async () => {
    const s = await signIn(t.app, shop.users.admin.email);
    await get(s, '/machines').expect(200);
    const inFlight = Array.from({ length: 16 }, (_, i) => get(s, i % 2 ? '/machines' : '/work-orders').then((r) => r));
    await sleep(20);
    const killed = await terminateAppBackends();
    const responses = await Promise.all(inFlight);
    expectOkOrUnavailable(responses);
    expect(killed).toBeGreaterThan(0);
    // The pools reconnect on their own: the same session keeps working.
    const after = await get(s, '/machines');
    expect(after.status).toBe(200);
    expect((await get(s, '/me')).status).toBe(200);
  });

  it('survives idle connections being terminated in both pools (ORM and sessions)', async () => {
    const s = await signIn(t.app, shop.users.operator.email);
    await get(s, '/machines').expect(200); // both pools now hold idle connections
    expect(await terminateAppBackends()).toBeGreaterThan(0);
    await sleep(300); // the idle clients' 'error' events fire here; unhandled, they would end the process
    await get(s, '/machines').expect(200);
  });

  it('recognises the ways pg and knex report a lost or unreachable database', () => {
    expect(isDatabaseUnavailable(Object.assign(new Error('terminating connection due to administrator command'), { code: '57P01' }))).toBe(true);
    expect(isDatabaseUnavailable(Object.assign(new Error('connect ECONNREFUSED 127.0.0.1:1'), { code: 'ECONNREFUSED' }))).toBe(true);
    expect(isDatabaseUnavailable(new Error('Connection terminated unexpectedly'))).toBe(true);
    expect(isDatabaseUnavailable(Object.assign(new Error('Knex: Timeout acquiring a connection.'), { name: 'KnexTimeoutError' }))).toBe(true);
    // pg's own connect timeout (connectionTimeoutMillis) while the server is too busy to finish the handshake.
    expect(isDatabaseUnavailable(new Error('timeout expired'))).toBe(true);
    expect(isDatabaseUnavailable(new Error('wrapped', { cause: Object.assign(new Error('x'), { code: '08006' }) }))).toBe(true);
    // Faults of the request or the code stay what they are.
    expect(isDatabaseUnavailable(Object.assign(new Error('duplicate key value'), { code: '23505' }))).toBe(false);
    expect(isDatabaseUnavailable(Object.assign(new Error('permission denied for table safety_sign_off'), { code: '42501' }))).toBe(false);
    expect(isDatabaseUnavailable(new Error('Cannot read properties of undefined'))).toBe(false);
  });
});

describe('the real server process (tsx server/index.ts)', () => {
  let server: ServerProcess;
  beforeAll(async () => {
    server = await startServer({ DATABASE_URL: process.env.DATABASE_URL! });
  });
  afterAll(async () => server?.stop());

  it('stays up when every database connection is terminated, and answers again', async () => {
    const s = await signInAt(server.url, shop.users.technician.email);
    await get(s, '/machines').expect(200);
    const inFlight = Array.from({ length: 10 }, () => get(s, '/machines').then((r) => r));
    const killed = await terminateAppBackends();
    expect(killed).toBeGreaterThan(0);
    expectOkOrUnavailable(await Promise.all(inFlight));
    await sleep(500);
    expect(server.alive(), server.output()).toBe(true);
    // Idle connections dropped too: terminate once more while nothing runs.
    expect(await terminateAppBackends()).toBeGreaterThan(0);
    await sleep(500);
    expect(server.alive(), server.output()).toBe(true);
    await get(s, '/machines').expect(200);
    const health = await fetch(`${server.url}/api/health`);
    expect(health.status).toBe(200);
    expect(server.output()).not.toMatch(/Unhandled|uncaught/i);
  });

  it('on SIGTERM stops accepting, finishes the request in flight and exits 0', async () => {
    const s = await signInAt(server.url, shop.users.admin.email);
    await get(s, '/machines').expect(200);
    // Hold the machine table so the next list request waits inside PostgreSQL.
    const su: pg.Client = await superuser();
    try {
      await su.query('begin');
      await su.query('lock table machine in access exclusive mode');
      const slow = get(s, '/machines').then((r) => r);
      for (let i = 0; ; i++) {
        const waiting = await su.query(
          `select count(*)::int as n from pg_stat_activity where usename = 'kerfbook' and datname = current_database() and wait_event_type = 'Lock'`,
        );
        if (waiting.rows[0].n > 0) break;
        if (i > 400) throw new Error('the request never reached the locked table');
        await sleep(50);
      }
      server.proc.kill('SIGTERM');
      // New connections are refused while the old request is still running.
      for (let i = 0; ; i++) {
        const refused = await fetch(`${server.url}/api/health`).then(
          () => false,
          () => true,
        );
        if (refused) break;
        if (i > 200) throw new Error('the server kept accepting connections after SIGTERM');
        await sleep(50);
      }
      expect(server.alive()).toBe(true);
      await su.query('commit');
      const res = await slow;
      expect(res.status).toBe(200);
      expect(JSON.stringify(res.body)).toContain('"code":"F1"');
    } finally {
      await su.query('rollback').catch(() => undefined);
      await su.end();
    }
    expect(await server.exited, server.output()).toBe(0);
  });
});
