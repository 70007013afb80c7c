/** Photos and PDFs kept with a work order. */
import type { EntityManager } from '@mikro-orm/postgresql';
import { WorkOrderAttachment } from './work-order.entity';
import type { Principal } from '../../http/principal';
import { notFound } from '../../http/errors';
import { recordActivity } from '../activity-log/activity-log.service';
import { findWorkOrder } from './work-orders.queries';

export async function addAttachment(
  em: EntityManager,
  who: Principal,
  id: string,
  file: { name: string; mime: string; data: Buffer },
): Promise<{ id: string }> {
  return em.transactional(async (tx) => {
    const wo = await findWorkOrder(tx, id);
    const a = tx.create(WorkOrderAttachment, {
      organization: who.orgId,
      workOrder: wo,
      fileName: file.name.replace(/[^\w.\- ()]+/g, '_').slice(0, 200) || 'file',
      mimeType: file.mime,
      size: file.data.length,
      data: file.data,
      uploadedBy: who.userId,
    });
    recordActivity(tx, who, 'work-order.attachment', { type: 'WorkOrder', id: wo.id }, { fileName: a.fileName, size: a.size, mimeType: a.mimeType });
    return { id: a.id };
  });
}

export async function getAttachment(em: EntityManager, workOrderId: string, attachmentId: string) {
  const a = await em.findOne(WorkOrderAttachment, { id: attachmentId, workOrder: workOrderId }, { populate: ['data'] });
  if (!a) throw notFound('Attachment');
  return { fileName: a.fileName, mimeType: a.mimeType, data: Buffer.from(a.data.unwrap() as Uint8Array) };
}
