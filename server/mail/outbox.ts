import type { EntityManager } from '@mikro-orm/postgresql';
import { OutboxMail } from './outbox.entity';
import { randomUUID } from 'node:crypto';
import { clock } from '../../shared/clock';

export type MailMessage = {
  to: string;
  subject: string;
  text: string;
  html?: string;
  kind: string;
  organizationId?: string | null;
};

/** Right-hand side of our Message-IDs: the sender address's domain (MAIL_FROM), read once. */
let messageIdDomain: string | null = null;
function ownDomain(): string {
  messageIdDomain ??= /@([A-Za-z0-9.-]+)>?\s*$/.exec(process.env.MAIL_FROM ?? '')?.[1] ?? 'kerfbook.example';
  return messageIdDomain;
}

/** A new RFC 5322 Message-ID. */
export const newMessageId = () => `<${randomUUID()}@${ownDomain()}>`;

/**
 * Queues a mail in the caller's unit of work: it is committed with the change that causes
 * it, or not at all. The sender delivers it later, at least once: its Message-ID is fixed here, so
 * a resend after a crash is the same message and mail systems drop the duplicate.
 */
export function queueMail(em: EntityManager, mail: MailMessage) {
  return em.create(OutboxMail, {
    toAddress: mail.to,
    subject: mail.subject,
    textBody: mail.text,
    htmlBody: mail.html ?? null,
    kind: mail.kind,
    organizationId: mail.organizationId ?? null,
    nextAttemptAt: clock.now(),
    messageId: newMessageId(),
  });
}
