import argon2 from 'argon2';
import { availableParallelism } from 'node:os';
import { createHash, randomBytes } from 'node:crypto';

/**
 * At most this many argon2 computations at once. Each one holds a libuv worker thread and
 * 64 MiB; a burst of sign-ins or signatures left unbounded took every worker, so PostgreSQL's
 * SCRAM handshake (also on that pool) could not open a connection within its timeout. The rest
 * wait their turn, which costs them no more time than sharing the cores would.
 */
const MAX_CONCURRENT = Math.max(1, Math.min(2, availableParallelism()));
let running = 0;
const waiting: (() => void)[] = [];

async function oneAtATime<T>(work: () => Promise<T>): Promise<T> {
  if (running >= MAX_CONCURRENT) await new Promise<void>((resolve) => waiting.push(resolve));
  else running++;
  try {
    return await work();
  } finally {
    // Hand the slot straight to the next in line, or free it.
    const next = waiting.shift();
    if (next) next();
    else running--;
  }
}

// argon2id with the library defaults (m=64 MiB, t=3, p=4), above OWASP's minimum profile.
export const hashPassword = (password: string) => oneAtATime(() => argon2.hash(password, { type: argon2.argon2id }));

export async function verifyPassword(hash: string | null | undefined, password: string): Promise<boolean> {
  if (!hash) {
    // Spend comparable time so an unknown account is not revealed by a fast answer.
    await oneAtATime(() => argon2.hash(password, { type: argon2.argon2id }));
    return false;
  }
  try {
    return await oneAtATime(() => argon2.verify(hash, password));
  } catch {
    return false;
  }
}

export const newToken = () => randomBytes(32).toString('base64url');
export const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');
