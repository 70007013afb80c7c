/**
 * A fault reported at the machine: raises the repair work order (through `raiseWorkOrders`) and,
 * when the reporter says the machine must stop, takes it out of service in the same transaction,
 * linked to that repair so signing the repair off returns the machine. The people responsible
 * get one mail: the out-of-service notice naming the repair, or else the new-work notice.
 */
import type { EntityManager } from '@mikro-orm/postgresql';
import { fileTypeFromBuffer } from 'file-type';
import { raiseWorkOrders } from '../work-orders/raise-work-orders';
import { WorkOrderAttachment } from '../work-orders/work-order.entity';
import type { Principal } from '../../http/principal';
import { conflict, fieldError } from '../../http/errors';
import { machineByCode } from './machines.service';
import { machineStatus, takeOutOfService } from './machine-state.service';
import { assertShopCode } from './failure-codes.service';
import { clock } from '../../../shared/clock';
import { PHOTO_TYPES } from '../../../shared/schemas/photos';
import type { FaultReportInput, FaultReportResult } from '../../../shared/schemas/machine-state';

/** The work order's title: the first line of the description, cut at a word near 100 characters. */
function titleOf(code: string, description: string): string {
  const first = description.split(/\r?\n/)[0].trim();
  const cut = first.length > 100 ? `${first.slice(0, 100).replace(/\s+\S*$/, '')}…` : first;
  return `Fault on ${code}: ${cut}`.slice(0, 160);
}

async function checkPhoto(photo: Buffer): Promise<string> {
  const type = await fileTypeFromBuffer(photo);
  if (!type || !(PHOTO_TYPES as readonly string[]).includes(type.mime)) {
    throw fieldError('photo', `The photo is not an image we take (JPEG, PNG or WebP)${type ? `; it looks like ${type.mime}` : ''}`);
  }
  return type.mime;
}

export async function reportFault(
  em: EntityManager,
  who: Principal,
  code: string,
  input: FaultReportInput,
  appUrl: string,
  photo?: { name: string; data: Buffer },
): Promise<FaultReportResult> {
  const mime = photo ? await checkPhoto(photo.data) : null;
  return em.transactional(async (tx) => {
    const machine = await machineByCode(tx, code);
    if (!machine.active)
      throw conflict(`Machine ${machine.code} is deactivated; faults cannot be reported on it`, [{ path: 'code', message: `${machine.code} is deactivated` }]);
    if (input.failureCode) await assertShopCode(tx, who.orgId, 'mode', input.failureCode, 'failureCode');
    const now = clock.now();
    const [wo] = await raiseWorkOrders(
      tx,
      who.orgId,
      who,
      [
        {
          standalone: {
            machineId: machine.id,
            kind: 'corrective',
            title: titleOf(machine.code, input.description),
            instructions: input.description,
            reason: `Fault reported at the machine by ${who.name}${input.takeOutOfService ? '; machine taken out of service' : ''}`,
            dueAt: input.takeOutOfService ? now : null,
            assigneeId: null,
            responsibleRole: 'technician',
            requiresLockout: false,
            safetyCritical: false,
            raisedById: who.userId,
            auditDetails: { fault: true, takeOutOfService: input.takeOutOfService, failureCode: input.failureCode },
          },
        },
      ],
      // Stopping the machine sends its own notice naming this repair: one mail, not two.
      input.takeOutOfService
        ? { mode: 'never', at: now }
        : { mode: 'now', appUrl, reason: `${who.name} reported a fault at the machine`, skipUserId: who.userId },
    );
    if (photo && mime) {
      tx.create(WorkOrderAttachment, {
        organization: who.orgId,
        workOrder: wo.id,
        fileName: photo.name.replace(/[^\w.\- ()]+/g, '_').slice(0, 200) || 'fault-photo',
        mimeType: mime,
        size: photo.data.length,
        data: photo.data,
        uploadedBy: who.userId,
      });
    }
    if (input.takeOutOfService) {
      await takeOutOfService(tx, who, {
        machineId: machine.id,
        reason: titleOf(machine.code, input.description).replace(/^Fault on [^:]+: /, 'Fault: '),
        kind: 'failure',
        workOrderId: wo.id,
        failureCode: input.failureCode,
      });
    }
    await tx.flush();
    const status = await machineStatus(tx, machine.id);
    return {
      workOrderId: wo.id,
      workOrderNumber: wo.number,
      status: { state: status.state, since: status.since?.toISOString() ?? null, reason: status.reason },
    };
  });
}
