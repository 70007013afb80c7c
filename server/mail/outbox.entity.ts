import { defineEntity, p, type InferEntity } from '@mikro-orm/core';
import { baseProperties } from '../modules/common/base';

/**
 * Transactional outbox: a mail row is written in the same transaction as the change that
 * causes it; the sender delivers it later with retries. Not org-filtered: the sender is a
 * system process that serves every shop.
 */
export const OutboxMail = defineEntity({
  name: 'OutboxMail',
  tableName: 'outbox_mail',
  indexes: [{ properties: ['status', 'nextAttemptAt'] }],
  properties: {
    ...baseProperties,
    organizationId: p.uuid().nullable(),
    toAddress: p.string().length(254),
    subject: p.string().length(300),
    textBody: p.text(),
    htmlBody: p.text().nullable(),
    kind: p.string().length(60),
    status: p.enum(['pending', 'sent', 'failed'] as const).default('pending'),
    attempts: p.integer().default(0),
    nextAttemptAt: p.datetime(),
    lastError: p.text().nullable(),
    sentAt: p.datetime().nullable(),
    /** Fixed when queued: every (re)send carries it, so receivers can drop a duplicate. */
    messageId: p.string().length(300).unique(),
  },
});
export type IOutboxMail = InferEntity<typeof OutboxMail>;
