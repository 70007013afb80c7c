// One server process for bench/api.ts, so the load generator does not share its event loop:
//   tsx bench/api-server.ts app  <database url>   the real app (createApp), no scheduler or mail
//   tsx bench/api-server.ts bare <database url>   Express + pg answering one indexed query
// Listens on a free port on 127.0.0.1 and prints `listening <port>` when ready.
import express from 'express';
import pg from 'pg';
import type { AddressInfo } from 'node:net';
import type { Server } from 'node:http';

const [mode, url] = process.argv.slice(2);
if ((mode !== 'app' && mode !== 'bare') || !url) {
  console.error('usage: tsx bench/api-server.ts app|bare <database url>');
  process.exit(2);
}

async function startApp(): Promise<Server> {
  // Logging off, as in the bare server; set before the logger module is loaded.
  process.env.LOG_LEVEL = 'silent';
  const { initORM } = await import('../server/db');
  const { createApp } = await import('../server/app');
  const { loadConfig } = await import('../server/config');
  const { ownerUrlFor } = await import('../server/db-roles');
  const config = loadConfig({
    ...process.env,
    NODE_ENV: 'production',
    DATABASE_URL: url,
    // Production names its migration owner; the bench database was migrated by it.
    MIGRATION_DATABASE_URL: ownerUrlFor(url),
    SESSION_SECRET: 'bench-session-secret-not-for-production',
    MAIL_CAPTURE: 'false',
    // The bundle measurement serves the built client too; the API bench does not need it.
    CLIENT_DIST: process.env.BENCH_CLIENT_DIST ?? '/nonexistent',
  });
  const orm = await initORM(url);
  const { app } = createApp({ orm, config });
  return app.listen(0, '127.0.0.1');
}

/** The floor: what Express and pg cost for one indexed query, with nothing of ours around it. */
async function startBare(): Promise<Server> {
  const pool = new pg.Pool({ connectionString: url, max: 10 });
  const { rows } = await pool.query<{ id: string }>(`select id from app_user where email = 'tech@alder-row.example'`);
  const userId = rows[0]?.id;
  if (!userId) throw new Error('demo technician missing: seed the database first');
  const app = express();
  app.disable('x-powered-by');
  app.get('/bare', async (_req, res) => {
    const r = await pool.query('select id, email, name from app_user where id = $1', [userId]);
    res.json(r.rows[0]);
  });
  return app.listen(0, '127.0.0.1');
}

const server = await (mode === 'app' ? startApp() : startBare());
if (!server.listening) await new Promise((resolve) => server.once('listening', resolve));
console.log(`listening ${(server.address() as AddressInfo).port}`);
process.on('SIGTERM', () => process.exit(0));
