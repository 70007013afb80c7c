import argon2 from 'argon2';
import { createHash, randomBytes } from 'node:crypto';

// argon2id with the library defaults (m=64 MiB, t=3, p=4), above OWASP's minimum profile.
export const hashPassword = (password: string) => argon2.hash(password, { type: argon2.argon2id });

export async function verifyPassword(hash: string | null | undefined, password: string): Promise<boolean> {
  if (!hash) {
    // Spend comparable time so an unknown account is not revealed by a fast answer.
    await argon2.hash(password, { type: argon2.argon2id });
    return false;
  }
  try {
    return await argon2.verify(hash, password);
  } catch {
    return false;
  }
}

export const newToken = () => randomBytes(32).toString('base64url');
export const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');
