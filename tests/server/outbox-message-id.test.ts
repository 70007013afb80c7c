import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { randomBytes } from 'node:crypto';
import type { MikroORM } from '@mikro-orm/postgresql';
import type { Transporter } from 'nodemailer';
import { initORM } from '../../server/db';
import { FakeSmtp } from '../../server/mail/fake-smtp';
import { createTransport } from '../../server/mail/transport';
import { deliverOutbox } from '../../server/mail/sender';
import { queueMail } from '../../server/mail/outbox';
import { OutboxMail } from '../../server/mail/outbox.entity';
import { loadConfig } from '../../server/config';

const PORT = 27_000 + Math.floor(Math.random() * 1000);
const config = loadConfig({ ...process.env, NODE_ENV: 'test', SMTP_PORT: String(PORT), MAIL_CAPTURE: 'true' });
const tag = randomBytes(4).toString('hex');
let orm: MikroORM;
let smtp: FakeSmtp;

beforeAll(async () => {
  orm = await initORM();
  smtp = new FakeSmtp(PORT);
  await smtp.start();
  // Start from an empty queue so only this file's rows are delivered here.
  await orm.em.getConnection().execute(`update outbox_mail set status = 'sent' where status = 'pending'`);
});
afterAll(() => smtp.stop());

describe('outbox Message-ID', () => {
  it('is fixed when the mail is queued, one per row', async () => {
    const em = orm.em.fork();
    const a = queueMail(em, { to: `a-${tag}@mail.example`, subject: 'a', text: 'a', kind: 'test' });
    const b = queueMail(em, { to: `b-${tag}@mail.example`, subject: 'b', text: 'b', kind: 'test' });
    await em.flush();
    const rows = await orm.em.fork().find(OutboxMail, { id: { $in: [a.id, b.id] } });
    for (const r of rows) expect(r.messageId).toMatch(/^<[^<>@\s]+@[^<>@\s]+>$/);
    expect(rows[0].messageId).not.toBe(rows[1].messageId);
  });

  it('is the same on a resend after a crash, so the receiving side can drop the duplicate', async () => {
    const to = `crash-${tag}@mail.example`;
    await orm.em.getConnection().execute(`update outbox_mail set status = 'sent' where status = 'pending'`);
    const em = orm.em.fork();
    const row = queueMail(em, { to, subject: 'work notice', text: 'body', kind: 'test' });
    await em.flush();
    const real = createTransport(config);
    // The relay takes the mail, then the process dies before it can mark the row sent.
    const crashing = {
      sendMail: async (m: Parameters<Transporter['sendMail']>[0]) => {
        await real.sendMail(m);
        throw new Error('process died after the hand-over');
      },
    } as unknown as Transporter;
    expect(await deliverOutbox(orm, crashing, config.MAIL_FROM)).toEqual({ sent: 0, failed: 1 });
    await orm.em.fork().nativeUpdate(OutboxMail, { id: row.id }, { nextAttemptAt: new Date() });
    expect(await deliverOutbox(orm, real, config.MAIL_FROM)).toEqual({ sent: 1, failed: 0 });

    const copies = smtp.mails.filter((m) => m.to.includes(to));
    expect(copies).toHaveLength(2); // at least once …
    const stored = await orm.em.fork().findOneOrFail(OutboxMail, row.id);
    expect(stored.status).toBe('sent');
    expect(copies.map((m) => m.messageId)).toEqual([stored.messageId, stored.messageId]); // … deduplicated by Message-ID
  });
});
