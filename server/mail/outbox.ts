import type { EntityManager } from '@mikro-orm/postgresql';
import { OutboxMail } from './outbox.entity';
import { clock } from '../../shared/clock';

export type MailMessage = {
  to: string;
  subject: string;
  text: string;
  html?: string;
  kind: string;
  organizationId?: string | null;
};

/**
 * Queues a mail in the caller's unit of work: it is committed with the change that causes
 * it, or not at all. The sender delivers it later.
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
  });
}
