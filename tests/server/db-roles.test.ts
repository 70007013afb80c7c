// The app role (the one the server connects as) cannot rewrite signed history: it owns no table,
// so it cannot switch off, drop or alter the safety log's triggers and constraints, and it has
// only INSERT and SELECT on the sign-off table.
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import type pg from 'pg';
import { makeTestApp } from '../setup/test-app';
import { migrate } from '../../server/migrate';
import { appRole, get, makeSafetyShop, ownerRole, PASSWORD, post, type SafetyShop } from './safety-helpers';

let t: Awaited<ReturnType<typeof makeTestApp>>;
let shop: SafetyShop;
let app: pg.Client;
beforeAll(async () => {
  t = await makeTestApp();
  shop = await makeSafetyShop(t.app, t.em(), 'roles');
  const req = await post(shop.s.safety, '/safety/ppe/requirements', {
    machineId: shop.machineId,
    task: 'Punching',
    items: ['safety-glasses'],
    otherItems: [],
    arcCurrentA: null,
    noise: [],
    cadence: 'shift',
  }).expect(201);
  await post(shop.s.operator, '/safety/ppe/checks', { requirementId: req.body.id, confirmed: ['safety-glasses'], password: PASSWORD }).expect(201);
  app = await appRole();
});
afterAll(async () => {
  await app.end();
  await t.close();
});

const signOffRows = async () =>
  (await app.query('select id, signer_name, hash from safety_sign_off where organization_id = $1 order by seq', [shop.orgId])).rows;

describe('database roles', () => {
  it('the server connects as a role that is neither superuser nor owner of the safety tables', async () => {
    const r = await app.query(`select current_user as me, r.rolsuper, r.rolcreatedb, r.rolcreaterole, r.rolbypassrls, t.tableowner
      from pg_roles r, pg_tables t where r.rolname = current_user and t.tablename = 'safety_sign_off'`);
    expect(r.rows).toEqual([{ me: 'kerfbook', rolsuper: false, rolcreatedb: false, rolcreaterole: false, rolbypassrls: false, tableowner: 'kerfbook_owner' }]);
    // The owner owns every table of the schema, so nothing is left that the app role could alter.
    const owned = await app.query(`select tablename from pg_tables where schemaname = 'public' and tableowner = current_user`);
    expect(owned.rows).toEqual([]);
  });

  it('the app role cannot disable, drop or replace the append-only triggers', async () => {
    await expect(app.query('alter table safety_sign_off disable trigger safety_sign_off_no_change')).rejects.toThrow(/must be owner of table safety_sign_off/);
    await expect(app.query('alter table safety_sign_off disable trigger all')).rejects.toThrow(/must be owner of table safety_sign_off/);
    await expect(app.query('drop trigger safety_sign_off_no_change on safety_sign_off')).rejects.toThrow(/must be owner of (table|relation) safety_sign_off/);
    // Nor replace the trigger's function: it may create nothing in the schema at all.
    await expect(
      app.query('create or replace function safety_sign_off_append_only() returns trigger language plpgsql as $$ begin return new; end $$'),
    ).rejects.toThrow(/permission denied for schema public/);
    await expect(app.query('set session_replication_role = replica')).rejects.toThrow(/permission denied to set parameter "session_replication_role"/);
    const triggers = await app.query(
      `select tgname, tgenabled from pg_trigger where tgrelid = 'safety_sign_off'::regclass and not tgisinternal order by tgname`,
    );
    expect(triggers.rows).toEqual([
      { tgname: 'safety_sign_off_no_change', tgenabled: 'O' },
      { tgname: 'safety_sign_off_no_truncate', tgenabled: 'O' },
      // The shop's revision (tests/server/shop-revision.test.ts).
      { tgname: 'shop_change_delete', tgenabled: 'O' },
      { tgname: 'shop_change_insert', tgenabled: 'O' },
      { tgname: 'shop_change_update', tgenabled: 'O' },
    ]);
  });

  it('the app role cannot drop constraints or the table', async () => {
    await expect(app.query('alter table safety_sign_off drop constraint safety_sign_off_pkey')).rejects.toThrow(/must be owner of table safety_sign_off/);
    await expect(app.query('alter table safety_chain_head drop constraint safety_chain_head_organization_id_unique')).rejects.toThrow(
      /must be owner of table safety_chain_head/,
    );
    await expect(app.query('drop table safety_sign_off cascade')).rejects.toThrow(/must be owner of table safety_sign_off/);
  });

  it('the app role can only insert and read sign-offs; it cannot update, delete or truncate them', async () => {
    const before = await signOffRows();
    expect(before).toHaveLength(1);
    const privileges = await app.query(`select privilege_type from information_schema.role_table_grants
      where table_name = 'safety_sign_off' and grantee = current_user order by privilege_type`);
    expect(privileges.rows.map((r) => r.privilege_type)).toEqual(['INSERT', 'SELECT']);
    await expect(app.query(`update safety_sign_off set signer_name = 'Someone Else' where organization_id = $1`, [shop.orgId])).rejects.toThrow(
      /permission denied for table safety_sign_off/,
    );
    await expect(app.query('delete from safety_sign_off where organization_id = $1', [shop.orgId])).rejects.toThrow(
      /permission denied for table safety_sign_off/,
    );
    await expect(app.query('truncate safety_sign_off')).rejects.toThrow(/permission denied for table safety_sign_off/);
    expect(await signOffRows()).toEqual(before);
  });

  it('the chain head is select, insert and update only for the app role', async () => {
    const privileges = await app.query(`select privilege_type from information_schema.role_table_grants
      where table_name = 'safety_chain_head' and grantee = current_user order by privilege_type`);
    expect(privileges.rows.map((r) => r.privilege_type)).toEqual(['INSERT', 'SELECT', 'UPDATE']);
    await expect(app.query('delete from safety_chain_head where organization_id = $1', [shop.orgId])).rejects.toThrow(
      /permission denied for table safety_chain_head/,
    );
    const v = await get(shop.s.safety, '/safety/chain/verify').expect(200);
    expect(v.body).toMatchObject({ ok: true, total: 1, headSeq: 1 });
  });

  it('the owner role, which runs migrations, is still bound by the append-only trigger', async () => {
    const owner = await ownerRole();
    try {
      await expect(owner.query(`update safety_sign_off set signer_name = 'Someone Else' where organization_id = $1`, [shop.orgId])).rejects.toThrow(
        /append-only: UPDATE/,
      );
    } finally {
      await owner.end();
    }
  });
});

describe('instances starting together', () => {
  it('each runs the migrations and grants at start-up without tripping over the other', async () => {
    // Two servers started at once both grant the app role its rights; PostgreSQL refuses a GRANT or
    // REVOKE on a table another transaction is changing, which once stopped one of them from starting.
    const results = await Promise.allSettled(Array.from({ length: 6 }, () => migrate()));
    expect(results.filter((r) => r.status === 'rejected').map((r) => String((r as PromiseRejectedResult).reason))).toEqual([]);
  });
});
