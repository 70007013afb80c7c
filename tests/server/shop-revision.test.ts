import { describe, it, expect, beforeAll, afterAll, afterEach } from 'vitest';
import pg from 'pg';
import type { EntityManager } from '@mikro-orm/postgresql';
import { makeShop, makeTestApp, patch, post, signIn, get, type SignedIn, type TestShop } from '../setup/test-app';
import { compactShopChanges, shopRevision } from '../../server/modules/shop-changes/shop-revision';
import { stationPages } from '../../server/modules/station/station.routes';
import { workOrderLists } from '../../server/modules/work-orders/work-orders.routes';
import { setClock } from '../../shared/clock';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let a: TestShop;
let b: TestShop;
let tech: SignedIn;
let op: SignedIn;
let cell: string;
let torch: string;
let db: pg.Client;

const revision = (shop: TestShop) => shopRevision(t.em() as EntityManager, shop.orgId);
const station = () => get(op, '/stations/S1').expect(200);

beforeAll(async () => {
  t = await makeTestApp();
  a = await makeShop(t.em(), 'revision');
  b = await makeShop(t.em(), 'revision-other');
  tech = await signIn(t.app, a.users.technician.email);
  op = await signIn(t.app, a.users.operator.email);
  cell = (await post(tech, '/machines', { code: 'S1', name: 'Cell', kind: 'punch-plasma-cell' }).expect(201)).body.id;
  torch = (await post(tech, '/machines', { code: 'S1-T', name: 'Torch', kind: 'torch', parentId: cell }).expect(201)).body.id;
  db = new pg.Client({ connectionString: process.env.DATABASE_URL });
  await db.connect();
});

afterEach(() => setClock(null));

afterAll(async () => {
  await db.end();
  await t.close();
});

describe('a shop revision', () => {
  it('every table that holds a shop’s rows reports its writes', async () => {
    // A table added without the triggers would let pages kept under the revision go stale.
    const { rows } = await db.query<{ table_name: string; triggers: string[] | null }>(
      `select c.table_name, array_agg(t.tgname::text order by t.tgname) filter (where t.tgname is not null) as triggers
         from information_schema.columns c
         join information_schema.tables tb using (table_schema, table_name)
         left join pg_trigger t on t.tgrelid = format('%I', c.table_name)::regclass and t.tgname like 'shop_change_%'
        where c.table_schema = 'public' and c.column_name = 'organization_id' and tb.table_type = 'BASE TABLE'
          and c.table_name not in ('shop_change', 'idempotency_key')
        group by c.table_name`,
    );
    expect(rows.length).toBeGreaterThan(40);
    const missing = rows.filter((r) => (r.triggers ?? []).join() !== 'shop_change_delete,shop_change_insert,shop_change_update').map((r) => r.table_name);
    expect(missing, 'call attach_shop_change_triggers(<table>) in the migration that creates them').toEqual([]);
  });

  it('grows with each committed write of the shop, and only of that shop', async () => {
    const before = BigInt(await revision(a));
    const otherBefore = await revision(b);
    await db.query(`update machine set name = 'Cell one' where id = $1`, [cell]);
    const afterUpdate = BigInt(await revision(a));
    expect(afterUpdate).toBeGreaterThan(before);
    await db.query(
      `insert into meter (id, created_at, updated_at, organization_id, machine_id, code, name, kind, unit)
                    values (gen_random_uuid(), now(), now(), $1, $2, 'x-count', 'Extra', 'count', 'starts')`,
      [a.orgId, torch],
    );
    const afterInsert = BigInt(await revision(a));
    expect(afterInsert).toBeGreaterThan(afterUpdate);
    await db.query(`delete from meter where machine_id = $1 and code = 'x-count'`, [torch]);
    expect(BigInt(await revision(a))).toBeGreaterThan(afterInsert);
    expect(await revision(b)).toBe(otherBefore);
  });

  it('follows the shop’s settings and its people’s names, but not a rolled-back write', async () => {
    let r = await revision(a);
    await db.query(`update organization set name = name where id = $1`, [a.orgId]);
    expect(BigInt(await revision(a))).toBeGreaterThan(BigInt(r));
    r = await revision(a);
    await db.query(`update app_user set name = 'Op A' where id = $1`, [a.users.operator.userId]);
    expect(BigInt(await revision(a))).toBeGreaterThan(BigInt(r));
    r = await revision(a);
    await db.query('begin');
    await db.query(`update machine set name = 'Never' where id = $1`, [cell]);
    await db.query('rollback');
    expect(await revision(a)).toBe(r);
  });

  it('keeps its value when the change rows are folded together', async () => {
    await db.query(`update machine set name = name where organization_id = $1`, [a.orgId]);
    const r = await revision(a);
    const other = await revision(b);
    const { rows: before } = await db.query(`select count(*)::int as n from shop_change where organization_id = $1`, [a.orgId]);
    expect(before[0].n).toBeGreaterThan(1);
    expect(await compactShopChanges(t.em() as EntityManager, a.orgId)).toBe(1);
    const { rows: after } = await db.query(`select count(*)::int as n from shop_change where organization_id = $1`, [a.orgId]);
    expect(after[0].n).toBe(1);
    expect(await revision(a)).toBe(r);
    expect(await revision(b)).toBe(other);
  });

  it('folds a shop’s change rows when a read finds many, keeping the revision', async () => {
    for (let i = 0; i < 210; i++) await db.query(`update machine set name = name where id = $1`, [cell]);
    const count = async () => (await db.query(`select count(*)::int as n from shop_change where organization_id = $1`, [a.orgId])).rows[0].n as number;
    expect(await count()).toBeGreaterThan(200);
    const r = await revision(a); // starts the fold in the background
    await expect.poll(count, { timeout: 10_000 }).toBe(1);
    expect(await revision(a)).toBe(r);
  });
});

describe('the station page kept under the revision', () => {
  it('is served again while nothing changed, and computed afresh after any write', async () => {
    const first = (await station()).body;
    const hits = stationPages.hits;
    const again = (await station()).body;
    expect(again).toEqual(first);
    expect(stationPages.hits).toBe(hits + 1);

    // A write through the API: the new counter shows at once.
    await post(tech, '/meters', { machineId: torch, code: 'arc-starts', name: 'Arc starts', kind: 'count', unit: 'starts' }).expect(201);
    const withMeter = (await station()).body;
    expect(withMeter.meters.map((m: { code: string }) => m.code)).toContain('arc-starts');

    // A write straight to the table (another instance, a script): shown at once as well.
    await db.query(`update machine set name = 'Renamed cell' where id = $1`, [cell]);
    expect((await station()).body.machine.name).toBe('Renamed cell');
    await patch(tech, `/machines/${cell}`, { name: 'Cell' }).expect(200);
    expect((await station()).body.machine.name).toBe('Cell');
  });

  it('turns a work order overdue when its due time passes, with nothing written', async () => {
    // Due well within the minute a page may be kept: only its due time can end the kept page.
    const dueAt = new Date(Date.now() + 45_000);
    await post(tech, '/work-orders', { machineId: cell, title: 'Check the torch lift', dueAt: dueAt.toISOString() }).expect(201);
    const row = (body: { due: { title: string; overdue: boolean }[] }) => body.due.find((w) => w.title === 'Check the torch lift')!;
    expect(row((await station()).body).overdue).toBe(false);
    const hits = stationPages.hits;
    expect(row((await station()).body).overdue).toBe(false);
    expect(stationPages.hits).toBe(hits + 1);
    setClock(new Date(dueAt.getTime() + 1_000));
    expect(row((await station()).body).overdue).toBe(true);
  });

  it('is computed afresh after a minute, and when the clock goes back', async () => {
    await station();
    const misses = stationPages.misses;
    setClock(new Date(Date.now() + 61_000));
    await station();
    expect(stationPages.misses).toBe(misses + 1);
    setClock(new Date(Date.now() - 3600_000));
    await station();
    expect(stationPages.misses).toBe(misses + 2);
  });
});

describe('work-order lists kept under the revision', () => {
  const list = (who: SignedIn, query = '') => get(who, `/work-orders${query}`).expect(200);

  it('are served again while nothing changed, per person and query, and show a new work order at once', async () => {
    const first = (await list(tech, '?status=active')).body;
    const hits = workOrderLists.hits;
    expect((await list(tech, '?status=active')).body).toEqual(first);
    expect(workOrderLists.hits).toBe(hits + 1);
    // Another query, and another person with the same query, are computed for themselves.
    await list(tech, '?status=active&sort=title');
    await list(op, '?status=active');
    expect(workOrderLists.hits).toBe(hits + 1);

    await post(tech, '/work-orders', { machineId: torch, title: 'Replace the torch lead' }).expect(201);
    const titles = (await list(tech, '?status=active')).body.rows.map((w: { title: string }) => w.title);
    expect(titles).toContain('Replace the torch lead');
    await db.query(`update work_order set title = 'Replace the torch lead now' where organization_id = $1 and title = 'Replace the torch lead'`, [a.orgId]);
    expect((await list(tech, '?status=active')).body.rows.map((w: { title: string }) => w.title)).toContain('Replace the torch lead now');
  });

  it('move a work order into the due-soon window when it gets there, with nothing written', async () => {
    // The list's due states follow the database clock: this waits for a real moment to pass.
    // Its window is the database's own "7 days" in the session's time zone, which across a DST
    // change is 167 or 169 hours, so the due time 6 s past the window's edge is asked of it too.
    const [{ due_at: dueAt }] = (await db.query<{ due_at: Date }>(`select now() + interval '7 days' + interval '6 seconds' as due_at`)).rows;
    await post(tech, '/work-orders', { machineId: torch, title: 'Grease the clamp rail', dueAt: dueAt.toISOString() }).expect(201);
    const state = async () =>
      (await list(tech, '?status=active&pageSize=100')).body.rows.find((w: { title: string }) => w.title === 'Grease the clamp rail').dueState as string;
    expect(await state()).toBe('later');
    await new Promise((resolve) => setTimeout(resolve, 7_000));
    expect(await state()).toBe('due-soon');
  });
});
