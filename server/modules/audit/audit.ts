import type { EntityManager } from '@mikro-orm/postgresql';
import { AuditEvent } from './audit-event.entity';
import type { Principal } from '../../http/principal';
import { executeBound } from '../../db';

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

export type AuditRow = { action: string; entityType: string; entityId: string | null; details: Record<string, unknown> | null };

/**
 * Writes many audit records of one shop with one statement, at once rather than at flush: for
 * system passes that raise or escalate thousands of work orders (no actor: the system did it).
 */
export async function insertAuditRows(em: EntityManager, orgId: string, rows: AuditRow[]): Promise<void> {
  if (rows.length === 0) return;
  await executeBound(
    em,
    `insert into audit_event (id, created_at, updated_at, organization_id, actor_id, action, entity_type, entity_id, details)
     select gen_random_uuid(), now(), now(), ?, null, x.action, x.entity_type, x.entity_id, x.details
       from jsonb_to_recordset(?::jsonb) as x(action text, entity_type text, entity_id text, details jsonb)`,
    [orgId, JSON.stringify(rows.map((r) => ({ action: r.action, entity_type: r.entityType, entity_id: r.entityId, details: r.details })))],
  );
}
