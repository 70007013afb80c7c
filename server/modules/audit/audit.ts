import type { EntityManager } from '@mikro-orm/postgresql';
import { AuditEvent } from './audit-event.entity';
import type { Principal } from '../../http/principal';

/** Records who did what to which record, in the caller's unit of work. */
export function recordAudit(
  em: EntityManager,
  who: Pick<Principal, 'orgId'> & { userId: string | null },
  action: string,
  entity: { type: string; id?: string | null },
  details?: Record<string, unknown>,
) {
  return em.create(AuditEvent, {
    organization: who.orgId,
    actor: who.userId,
    action,
    entityType: entity.type,
    entityId: entity.id ?? null,
    details: details ?? null,
  });
}
