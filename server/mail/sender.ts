import type { MikroORM } from '@mikro-orm/postgresql';
import type { Transporter } from 'nodemailer';
import { clock } from '../../shared/clock';

export const MAX_ATTEMPTS = 12;

/** Exponential backoff: 30 s, 1 min, 2 min … capped at one hour. */
export function backoffMs(attempts: number): number {
  return Math.min(30_000 * 2 ** Math.max(0, attempts - 1), 3_600_000);
}

type Row = { id: string; message_id: string; to_address: string; subject: string; text_body: string; html_body: string | null; attempts: number };

/**
 * Delivers due outbox mails. Each row is locked (FOR UPDATE SKIP LOCKED) for the length of
 * its delivery, so several instances or overlapping runs never send the same mail at the same
 * time. A crash after the relay took a mail but before the commit sends it again on restart:
 * delivery is at least once, deduplicated by the row's fixed Message-ID.
 */
export async function deliverOutbox(orm: MikroORM, transport: Transporter, from: string, batch = 50): Promise<{ sent: number; failed: number }> {
  let sent = 0;
  let failed = 0;
  for (let i = 0; i < batch; i++) {
    const outcome = await orm.em.fork().transactional(async (em) => {
      // em.execute runs inside this transaction, so the row lock lasts until commit.
      const conn = em;
      const rows: Row[] = await conn.execute(
        `select id, message_id, to_address, subject, text_body, html_body, attempts from outbox_mail
          where status = 'pending' and next_attempt_at <= now()
          order by next_attempt_at, created_at limit 1 for update skip locked`,
      );
      const row = rows[0];
      if (!row) return 'empty' as const;
      try {
        // The row's own Message-ID: a resend after a crash between hand-over and commit is the same message.
        await transport.sendMail({
          from,
          to: row.to_address,
          subject: row.subject,
          text: row.text_body,
          html: row.html_body ?? undefined,
          messageId: row.message_id,
        });
        await conn.execute(
          `update outbox_mail set status = 'sent', sent_at = now(), updated_at = now(), attempts = attempts + 1, last_error = null where id = ?`,
          [row.id],
        );
        return 'sent' as const;
      } catch (err) {
        const attempts = row.attempts + 1;
        const status = attempts >= MAX_ATTEMPTS ? 'failed' : 'pending';
        const next = new Date(clock.ms() + backoffMs(attempts));
        await conn.execute(`update outbox_mail set status = ?, attempts = ?, next_attempt_at = ?, last_error = ?, updated_at = now() where id = ?`, [
          status,
          attempts,
          next,
          String(err instanceof Error ? err.message : err).slice(0, 2000),
          row.id,
        ]);
        return 'failed' as const;
      }
    });
    if (outcome === 'empty') break;
    if (outcome === 'sent') sent++;
    else failed++;
  }
  return { sent, failed };
}

/** Runs the sender every few seconds; returns a stop function. */
export function startOutboxSender(orm: MikroORM, transport: Transporter, from: string, intervalMs = 5_000, log?: (msg: string, err?: unknown) => void) {
  let running = false;
  let stopped = false;
  const tick = async () => {
    if (running || stopped) return;
    running = true;
    try {
      const r = await deliverOutbox(orm, transport, from);
      if (r.sent || r.failed) log?.(`outbox: sent ${r.sent}, failed ${r.failed}`);
    } catch (err) {
      log?.('outbox sender error', err);
    } finally {
      running = false;
    }
  };
  const timer = setInterval(tick, intervalMs);
  timer.unref();
  void tick();
  return async () => {
    stopped = true;
    clearInterval(timer);
    while (running) await new Promise((r) => setTimeout(r, 20));
  };
}
