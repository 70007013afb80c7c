import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import { randomBytes } from 'node:crypto';
import { makeTestApp } from '../setup/test-app';
import { initORM } from '../../server/db';
import { FakeSmtp } from '../../server/mail/fake-smtp';
import { createTransport } from '../../server/mail/transport';
import { deliverOutbox } from '../../server/mail/sender';
import { queueMail } from '../../server/mail/outbox';
import { OutboxMail } from '../../server/mail/outbox.entity';
import { loadConfig } from '../../server/config';
import type { MikroORM } from '@mikro-orm/postgresql';

const PORT = 25_000 + Math.floor(Math.random() * 1000);
let orm: MikroORM;
let smtp: FakeSmtp;
let t: Awaited<ReturnType<typeof makeTestApp>>;
const config = loadConfig({ ...process.env, NODE_ENV: 'test', SMTP_PORT: String(PORT), MAIL_CAPTURE: 'true' });
const transport = createTransport(config);
const tag = randomBytes(4).toString('hex');

beforeAll(async () => {
  t = await makeTestApp();
  orm = await initORM();
  smtp = new FakeSmtp(PORT);
  // Start from an empty queue so counts below are exact.
  await orm.em.getConnection().execute(`update outbox_mail set status = 'sent' where status = 'pending'`);
});
afterAll(async () => {
  await smtp.stop();
  await t.close();
});

const addresses = (n: number, prefix: string) => Array.from({ length: n }, (_, i) => `${prefix}-${i}-${tag}@mail.example`);

describe('transactional outbox', () => {
  it('writes no mail when the causing transaction rolls back', async () => {
    const to = `rollback-${tag}@mail.example`;
    await expect(
      orm.em.fork().transactional(async (em) => {
        queueMail(em, { to, subject: 's', text: 't', kind: 'test' });
        await em.flush();
        throw new Error('business rule failed');
      }),
    ).rejects.toThrow('business rule failed');
    expect(await orm.em.fork().count(OutboxMail, { toAddress: to })).toBe(0);
  });

  it('keeps mail while the server is down and delivers each exactly once when it is back', async () => {
    const to = addresses(5, 'down');
    const em = orm.em.fork();
    for (const a of to) queueMail(em, { to: a, subject: `hello ${a}`, text: 'body', kind: 'test' });
    await em.flush();

    // SMTP server not running: every attempt fails, rows stay pending with a backoff.
    const failed = await deliverOutbox(orm, transport, config.MAIL_FROM);
    expect(failed).toEqual({ sent: 0, failed: 5 });
    const pending = await orm.em.fork().find(OutboxMail, { toAddress: { $in: to } });
    expect(pending.every((m) => m.status === 'pending' && m.attempts === 1 && m.lastError)).toBe(true);
    expect(pending.every((m) => m.nextAttemptAt.getTime() > Date.now())).toBe(true);

    // Server back; the backoff has passed.
    await smtp.start();
    await orm.em.fork().nativeUpdate(OutboxMail, { toAddress: { $in: to } }, { nextAttemptAt: new Date() });
    // Two senders at once (two instances) must not double-send.
    const [r1, r2] = await Promise.all([deliverOutbox(orm, transport, config.MAIL_FROM), deliverOutbox(orm, transport, config.MAIL_FROM)]);
    expect(r1.sent + r2.sent).toBe(5);
    expect(await deliverOutbox(orm, transport, config.MAIL_FROM)).toEqual({ sent: 0, failed: 0 });

    for (const a of to) expect(smtp.mails.filter((m) => m.to.includes(a))).toHaveLength(1);
    const sent = await orm.em.fork().find(OutboxMail, { toAddress: { $in: to } });
    expect(sent.every((m) => m.status === 'sent' && m.sentAt)).toBe(true);
  });
});
