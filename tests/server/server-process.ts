// Starts the real server (`tsx server/index.ts`) as a child process on loopback, for the fault,
// shutdown and several-instance tests; and the superuser tools those tests use on PostgreSQL.
import { spawn, type ChildProcess } from 'node:child_process';
import { createServer } from 'node:net';
import supertest from 'supertest';
import type TestAgent from 'supertest/lib/agent';
import { DEMO_PASSWORD } from '../../seed/factories';
import type { SignedIn } from '../setup/test-app';
import { superuser } from './safety-helpers';

/** A port nobody listens on right now (the kernel picks it). */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer();
    srv.once('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const port = (srv.address() as { port: number }).port;
      srv.close(() => resolve(port));
    });
  });
}

export const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

export type ServerProcess = {
  proc: ChildProcess;
  url: string;
  port: number;
  output: () => string;
  /** Resolves with the exit code (or the signal's name) once the process has ended. */
  exited: Promise<number | string>;
  alive: () => boolean;
  stop: () => Promise<void>;
};

export async function startServer(env: Record<string, string>, readyTimeoutMs = 120_000): Promise<ServerProcess> {
  const port = await freePort();
  const smtpPort = await freePort();
  const proc = spawn('node_modules/.bin/tsx', ['server/index.ts'], {
    env: {
      ...process.env,
      NODE_ENV: 'test',
      HOST: '127.0.0.1',
      PORT: String(port),
      SMTP_PORT: String(smtpPort),
      MAIL_CAPTURE: 'true',
      LOG_LEVEL: 'warn',
      CLIENT_DIST: '/nonexistent',
      ...env,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let out = '';
  proc.stdout!.on('data', (d) => (out += d));
  proc.stderr!.on('data', (d) => (out += d));
  let ended = false;
  const exited = new Promise<number | string>((resolve) =>
    proc.on('exit', (code, signal) => {
      ended = true;
      resolve(code ?? signal ?? 'unknown');
    }),
  );
  const url = `http://127.0.0.1:${port}`;
  const deadline = Date.now() + readyTimeoutMs;
  for (;;) {
    if (ended) throw new Error(`server exited during start-up:\n${out}`);
    const ok = await fetch(`${url}/api/health`).then(
      (r) => r.ok,
      () => false,
    );
    if (ok) break;
    if (Date.now() > deadline) {
      proc.kill('SIGKILL');
      throw new Error(`server did not answer within ${readyTimeoutMs} ms:\n${out}`);
    }
    await sleep(250);
  }
  return {
    proc,
    url,
    port,
    output: () => out,
    exited,
    alive: () => !ended,
    stop: async () => {
      if (ended) return;
      proc.kill('SIGTERM');
      const timer = setTimeout(() => proc.kill('SIGKILL'), 30_000);
      await exited;
      clearTimeout(timer);
    },
  };
}

/** Signs in on a running server through the real endpoints. */
export async function signInAt(url: string, email: string, password = DEMO_PASSWORD): Promise<SignedIn> {
  const agent: TestAgent = supertest.agent(url);
  const first = await agent.get('/api/auth/csrf').expect(200);
  const res = await agent.post('/api/auth/login').set('X-CSRF-Token', first.body.token).send({ email, password });
  if (res.status !== 200) throw new Error(`sign-in as ${email} failed: ${res.status} ${JSON.stringify(res.body)}`);
  return { agent, csrf: res.body.csrfToken };
}

/** Ends every connection of the app role to the test database, as a failover or an administrator would. */
export async function terminateAppBackends(): Promise<number> {
  const su = await superuser();
  try {
    const r = await su.query(`select count(pg_terminate_backend(pid))::int as n from pg_stat_activity
      where usename = 'kerfbook' and datname = current_database() and pid <> pg_backend_pid()`);
    return r.rows[0].n;
  } finally {
    await su.end();
  }
}
