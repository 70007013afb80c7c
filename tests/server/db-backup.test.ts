// npm run db:backup / db:restore (Debian's pg_dump and pg_restore): a shop's data, and its signed
// safety history, come back whole in an empty database, and the sign-off chain verifies there.
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { randomBytes } from 'node:crypto';
import pg from 'pg';
import { MikroORM, type EntityManager } from '@mikro-orm/postgresql';
import { makeTestApp } from '../setup/test-app';
import { approvedProcedure, makeSafetyShop, PASSWORD, post, superuser, type SafetyShop } from './safety-helpers';
import { createOrmConfig } from '../../server/mikro-orm.config';
import { verifyShopChain } from '../../server/modules/safety/chain';
import { ownerUrlFor } from '../../server/db-roles';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let shop: SafetyShop;
const target = `kerfbook_restore_${randomBytes(4).toString('hex')}`;
const workDir = mkdtempSync(path.join(tmpdir(), 'kerfbook-backup-'));
const sourceUrl = new URL(process.env.DATABASE_URL!);
const targetUrl = (() => {
  const u = new URL(process.env.DATABASE_URL!);
  u.pathname = `/${target}`;
  return u.toString();
})();

beforeAll(async () => {
  t = await makeTestApp();
  shop = await makeSafetyShop(t.app, t.em(), 'backup');
  await approvedProcedure(shop);
  const req = await post(shop.s.safety, '/safety/ppe/requirements', {
    machineId: shop.machineId,
    task: 'Punching',
    items: ['safety-glasses'],
    otherItems: [],
    arcCurrentA: null,
    noise: [],
    cadence: 'shift',
  }).expect(201);
  for (const who of [shop.s.operator, shop.s.technician])
    await post(who, '/safety/ppe/checks', { requirementId: req.body.id, confirmed: ['safety-glasses'], password: PASSWORD }).expect(201);
});

afterAll(async () => {
  await t.close();
  const su = await superuser();
  try {
    await su.query(`drop database if exists ${target} with (force)`);
  } finally {
    await su.end();
  }
  rmSync(workDir, { recursive: true, force: true });
});

const npmRun = (args: string[]) =>
  execFileSync('npm', ['run', '--silent', ...args], { env: { ...process.env, KERFBOOK_DB: sourceUrl.pathname.slice(1) }, encoding: 'utf8', stdio: 'pipe' });

async function count(url: string, sql: string, params: unknown[]): Promise<number> {
  const c = new pg.Client({ connectionString: url });
  await c.connect();
  try {
    return (await c.query(sql, params)).rows[0].n;
  } finally {
    await c.end();
  }
}

describe('backup and restore', () => {
  it('restores a shop into an empty database where its sign-off chain verifies and stays append-only', async () => {
    const file = path.join(workDir, 'shop.dump');
    expect(npmRun(['db:backup', '--', file])).toMatch(/Backup of kerfbook_test written to/);
    expect(statSync(file).size).toBeGreaterThan(10_000);

    // A new, empty database, as after losing the server.
    const owner = new pg.Client({ connectionString: ownerUrlFor(process.env.DATABASE_URL!).replace(/\/[^/]*$/, '/postgres') });
    await owner.connect();
    await owner.query(`create database ${target}`);
    await owner.end();
    expect(npmRun(['db:restore', '--', file, target])).toMatch(new RegExp(`Restored .* into ${target}`));

    const signOffs = 'select count(*)::int as n from safety_sign_off where organization_id = $1';
    const before = await count(process.env.DATABASE_URL!, signOffs, [shop.orgId]);
    expect(before).toBe(5); // the approval, two training records (technician and safety officer) and two PPE checks
    expect(await count(targetUrl, signOffs, [shop.orgId])).toBe(before);
    expect(await count(targetUrl, 'select count(*)::int as n from membership where organization_id = $1', [shop.orgId])).toBe(4);
    // Sessions signed in when the backup was taken do not come back: everyone signs in again.
    expect(await count(process.env.DATABASE_URL!, 'select count(*)::int as n from session', [])).toBeGreaterThan(0);
    expect(await count(targetUrl, 'select count(*)::int as n from session', [])).toBe(0);

    // Verified in the restored database, as the app role the server would use there.
    const orm = await MikroORM.init({ ...createOrmConfig(targetUrl), pool: { min: 0, max: 1 } });
    try {
      const v = await verifyShopChain(orm.em.fork() as EntityManager, shop.orgId);
      expect(v).toMatchObject({ ok: true, total: before, headSeq: before });
    } finally {
      await orm.close(true);
    }

    // The restore brings back the triggers and the app role's narrow rights, not more.
    const app = new pg.Client({ connectionString: targetUrl });
    await app.connect();
    try {
      await expect(app.query(`update safety_sign_off set note = 'x' where organization_id = $1`, [shop.orgId])).rejects.toThrow(
        /permission denied for table safety_sign_off/,
      );
      await expect(app.query('alter table safety_sign_off disable trigger all')).rejects.toThrow(/must be owner of table safety_sign_off/);
    } finally {
      await app.end();
    }
    const o = new pg.Client({ connectionString: ownerUrlFor(targetUrl) });
    await o.connect();
    try {
      await expect(o.query(`delete from safety_sign_off where organization_id = $1`, [shop.orgId])).rejects.toThrow(/append-only: DELETE/);
    } finally {
      await o.end();
    }
  }, 180_000);

  it('refuses to restore over a database that already has tables', async () => {
    const file = path.join(workDir, 'shop.dump');
    let failure = '';
    try {
      npmRun(['db:restore', '--', file, sourceUrl.pathname.slice(1)]);
    } catch (err) {
      failure = String((err as { stderr?: string }).stderr);
    }
    expect(failure).toMatch(/is not empty/);
  });
});
