/**
 * Copies of the sign-off chain's head kept outside the database: a daily mail to the shop's
 * safety officers and a download from the safety audit page. Each copy carries the head's
 * sequence number and hash, signed with an HMAC (RFC 2104, SHA-256) under a server secret, so a
 * mail or file someone made up does not check out. Each copy is also recorded (append-only), and
 * verification checks the chain still holds that hash at that number: a history rewritten below
 * the copy, hashes and head recomputed to match, no longer does.
 */
import { createHmac, randomUUID, timingSafeEqual } from 'node:crypto';
import { DateTime } from 'luxon';
import type { EntityManager, MikroORM } from '@mikro-orm/postgresql';
import { queueMail } from '../../mail/outbox';
import { renderMail } from '../../mail/templates';
import { clock } from '../../../shared/clock';
import type { ChainCopyCheck, ChainHeadCopy } from '../../../shared/schemas/safety-sign-offs';

/** The key copies are signed with: the configured secret, or one derived from the session secret. */
export function chainCopyKey(config: { CHAIN_COPY_SECRET?: string; SESSION_SECRET: string }): Buffer {
  if (config.CHAIN_COPY_SECRET) return Buffer.from(config.CHAIN_COPY_SECRET, 'utf8');
  return createHmac('sha256', config.SESSION_SECRET).update('kerfbook chain-head copy key').digest();
}

/** Exactly what is signed: every field of the copy but the signature, one per line. */
const signedText = (c: Omit<ChainHeadCopy, 'signature'>) => [c.format, c.shopId, c.shopName, String(c.seq), c.hash, c.madeAt, c.via].join('\n');

export const signCopy = (key: Buffer, c: Omit<ChainHeadCopy, 'signature'>) => createHmac('sha256', key).update(signedText(c), 'utf8').digest('hex');

function signatureHolds(key: Buffer, c: ChainHeadCopy): boolean {
  const expected = Buffer.from(signCopy(key, c), 'hex');
  const given = Buffer.from(String(c.signature), 'hex');
  return given.length === expected.length && timingSafeEqual(given, expected);
}

type Head = { seq: number; hash: string };
async function headOf(em: EntityManager, orgId: string): Promise<Head | null> {
  const [h] = await em.execute<{ last_seq: number; last_hash: string }[]>(`select last_seq, last_hash from safety_chain_head where organization_id = ?`, [
    orgId,
  ]);
  return h && Number(h.last_seq) > 0 ? { seq: Number(h.last_seq), hash: h.last_hash } : null;
}

/** Makes and records one signed copy of the shop's current head (inside the caller's transaction), or null while the chain is empty. */
export async function recordChainCopy(
  tx: EntityManager,
  key: Buffer,
  shop: { id: string; name: string },
  via: ChainHeadCopy['via'],
  opts: { madeById?: string | null; localDate?: string | null } = {},
): Promise<ChainHeadCopy | null> {
  const head = await headOf(tx, shop.id);
  if (!head) return null;
  const madeAt = clock.now();
  const unsigned = {
    format: 'kerfbook-chain-head/1' as const,
    shopId: shop.id,
    shopName: shop.name,
    seq: head.seq,
    hash: head.hash,
    madeAt: madeAt.toISOString(),
    via,
  };
  const copy: ChainHeadCopy = { ...unsigned, signature: signCopy(key, unsigned) };
  await tx.execute(
    `insert into safety_chain_copy (id, organization_id, seq, hash, made_at, via, made_by_id, local_date, signature) values (?, ?, ?, ?, ?, ?, ?, ?, ?)`,
    [randomUUID(), shop.id, copy.seq, copy.hash, madeAt, via, opts.madeById ?? null, opts.localDate ?? null, copy.signature],
  );
  return copy;
}

export type CopyComparison =
  { ok: true; copy: { seq: number; hash: string; madeAt: string; via: string } | null } | { ok: false; seq: number; message: string };

/** Does the stored chain still hold, at its number, the hash of the newest copy that left the database? */
export async function compareWithLastCopy(em: EntityManager, orgId: string): Promise<CopyComparison> {
  const conn = em.getConnection();
  const [copy] = await conn.execute<{ seq: number; hash: string; made_at: Date; via: string }[]>(
    `select seq, hash, made_at, via from safety_chain_copy where organization_id = ? order by made_at desc, seq desc limit 1`,
    [orgId],
  );
  if (!copy) return { ok: true, copy: null };
  return compareWith(em, orgId, { seq: Number(copy.seq), hash: copy.hash, madeAt: new Date(copy.made_at).toISOString(), via: copy.via });
}

async function compareWith(em: EntityManager, orgId: string, copy: { seq: number; hash: string; madeAt: string; via: string }): Promise<CopyComparison> {
  const [row] = await em
    .getConnection()
    .execute<{ hash: string }[]>(`select hash from safety_sign_off where organization_id = ? and seq = ?`, [orgId, copy.seq]);
  const sent = `the chain head ${copy.via === 'mail' ? 'mailed to the safety officers' : 'downloaded'} at ${copy.madeAt} (record #${copy.seq}, hash ${copy.hash.slice(0, 12)}…)`;
  if (!row) {
    return { ok: false, seq: copy.seq, message: `Chain broken: ${sent} is no longer in the database; records up to #${copy.seq} were removed.` };
  }
  if (row.hash !== copy.hash) {
    return {
      ok: false,
      seq: copy.seq,
      message: `Chain broken: record #${copy.seq} now has hash ${row.hash.slice(0, 12)}…, not the one in ${sent}; the history up to it was rewritten.`,
    };
  }
  return { ok: true, copy };
}

/** Checks a copy someone kept (a mail's or a download's JSON): was it signed by this server, and does the chain still hold it? */
export async function checkKeptCopy(em: EntityManager, key: Buffer, orgId: string, copy: ChainHeadCopy): Promise<ChainCopyCheck> {
  if (copy.shopId !== orgId) return { signatureValid: false, matches: false, message: 'This copy belongs to another shop.' };
  if (!signatureHolds(key, copy)) {
    return { signatureValid: false, matches: false, message: 'The signature does not check out: this copy was not made by this server, or it was changed.' };
  }
  const compared = await compareWith(em, orgId, copy);
  return compared.ok
    ? { signatureValid: true, matches: true, message: `The chain still holds record #${copy.seq} with the hash of this copy.` }
    : { signatureValid: true, matches: false, message: compared.message };
}

/**
 * The daily mail: once per shop-local day, each active safety officer gets the signed head.
 * A shop with no signatures yet or no safety officer gets none. Returns counts for the job run.
 */
export async function mailChainCopies(orm: MikroORM, key: Buffer, appUrl: string, now: Date, scope: { orgId?: string }): Promise<Record<string, number>> {
  const shops = await orm.em
    .fork()
    .execute<{ id: string; name: string; time_zone: string }[]>(
      `select id, name, time_zone from organization ${scope.orgId ? 'where id = ?' : ''} order by created_at`,
      scope.orgId ? [scope.orgId] : [],
    );
  let copies = 0;
  let mails = 0;
  for (const shop of shops) {
    const localDate = DateTime.fromJSDate(now, { zone: shop.time_zone }).toISODate()!;
    await orm.em.fork().transactional(async (tx) => {
      // One pass at a time holds the advisory lock, so this check and the insert below do not race.
      const [sent] = await tx.execute(`select 1 from safety_chain_copy where organization_id = ? and via = 'mail' and local_date = ?`, [shop.id, localDate]);
      if (sent) return;
      const officers = await tx.execute<{ email: string; name: string }[]>(
        `select u.email, u.name from membership m join app_user u on u.id = m.user_id where m.organization_id = ? and m.active and m.role = 'safety' order by u.email`,
        [shop.id],
      );
      if (officers.length === 0) return;
      const copy = await recordChainCopy(tx, key, shop, 'mail', { localDate });
      if (!copy) return;
      copies++;
      for (const o of officers) {
        queueMail(tx, {
          to: o.email,
          kind: 'safety-chain-copy',
          organizationId: shop.id,
          subject: `Sign-off chain of ${shop.name} on ${localDate}: record #${copy.seq}`,
          ...renderMail({
            heading: 'Today’s copy of the sign-off chain',
            paragraphs: [
              `Hello ${o.name},`,
              `The newest safety signature at ${shop.name} is record #${copy.seq}, with hash ${copy.hash}.`,
              'Keep this mail. If the stored history were ever rewritten or cut short, this copy shows it: paste the block below into “Check a kept copy” on the safety audit page, or compare the number and hash with a verification there.',
              JSON.stringify(copy),
            ],
            action: { label: 'Open the safety audit', url: `${appUrl}/safety/audit` },
          }),
        });
        mails++;
      }
    });
  }
  return { chainCopiesMade: copies, chainCopyMailsQueued: mails };
}
