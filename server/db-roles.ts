import type { Knex } from '@mikro-orm/postgresql';

/**
 * Two database roles: the owner runs migrations and owns every table, trigger and constraint;
 * the app role the server connects as gets table privileges only. Since it owns nothing, it
 * cannot ALTER, DISABLE or DROP the safety log's triggers, and the sign-off table is
 * INSERT/SELECT only for it.
 */
export const OWNER_ROLE = 'kerfbook_owner';

/** The private cluster's owner role on the same host and database as `databaseUrl`. */
export function ownerUrlFor(databaseUrl: string): string {
  const url = new URL(databaseUrl);
  url.username = OWNER_ROLE;
  url.password = process.env.KERFBOOK_DB_OWNER_PASSWORD ?? 'kerfbook-owner';
  return url.toString();
}

export function roleOf(databaseUrl: string): string {
  return decodeURIComponent(new URL(databaseUrl).username);
}

const ident = (name: string) => `"${name.replace(/"/g, '""')}"`;

/** Tables whose rows the app role may add and read but never change or remove. */
const APPEND_ONLY_TABLES = [
  'safety_sign_off',
  'machine_state_change',
  'safety_chain_copy',
  'purchase_receipt',
  'light_curtain_check',
  'safety_event',
  'machine_pre_use_check',
];
/** Tables the app role may add, read and update, but not delete from. */
const NO_DELETE_TABLES = ['safety_chain_head', 'machine_downtime', 'safety_lockout_test_window'];

/**
 * Grants the app role what the server needs, run by the owner after every migration run
 * (idempotent). Default privileges cover tables that later migrations create.
 */
export async function grantAppRole(knex: Knex, appRole: string): Promise<void> {
  const app = ident(appRole);
  const statements = [
    `grant usage on schema public to ${app}`,
    `grant select, insert, update, delete on all tables in schema public to ${app}`,
    `grant usage, select on all sequences in schema public to ${app}`,
    `alter default privileges in schema public grant select, insert, update, delete on tables to ${app}`,
    `alter default privileges in schema public grant usage, select on sequences to ${app}`,
    ...APPEND_ONLY_TABLES.map((t) => `revoke update, delete, truncate on ${ident(t)} from ${app}`),
    ...NO_DELETE_TABLES.map((t) => `revoke delete, truncate on ${ident(t)} from ${app}`),
    // The server reads nothing of the migration history and must not rewrite it.
    `revoke insert, update, delete, truncate on "mikro_orm_migrations" from ${app}`,
  ];
  // Instances starting together both grant, and PostgreSQL refuses a GRANT or REVOKE on a table
  // another transaction is changing ("tuple concurrently updated"): they take turns on a lock.
  await knex.transaction(async (trx) => {
    await trx.raw(`select pg_advisory_xact_lock(hashtext('kerfbook:grant-app-role'))`);
    for (const sql of statements) await trx.raw(sql);
  });
}
