import pg from 'pg';
import { ownerUrlFor } from '../server/db-roles';

/** Creates the bench database when missing and empties it, so every run starts alike (as the owner role, which migrates it). */
export async function freshDatabase(appUrl: string) {
  const url = ownerUrlFor(appUrl);
  const target = new URL(url);
  const dbName = target.pathname.slice(1);
  const adminUrl = new URL(url);
  adminUrl.pathname = '/postgres';
  const admin = new pg.Client({ connectionString: adminUrl.toString() });
  await admin.connect();
  const exists = await admin.query('select 1 from pg_database where datname = $1', [dbName]);
  if (!exists.rowCount) await admin.query(`create database "${dbName}"`);
  await admin.end();
  const c = new pg.Client({ connectionString: url });
  await c.connect();
  await c.query('drop schema if exists public cascade; create schema public;');
  await c.end();
}
