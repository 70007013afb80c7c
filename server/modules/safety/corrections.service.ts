import type { EntityManager } from '@mikro-orm/postgresql';
import { SafetySignOff } from './sign-off.entity';
import { appendSignOff } from './chain';
import { forbidden, notFound } from '../../http/errors';
import { recordActivity } from '../activity-log/activity-log.service';
import type { Principal } from '../../http/principal';

/**
 * A signature is never edited. A correction is a new signature that points at the one it
 * corrects; the signer may correct their own records, the safety officer anyone's.
 */
export async function correctSignOff(em: EntityManager, who: Principal, id: string, note: string) {
  return em.transactional(async (tx) => {
    const original = await tx.findOne(SafetySignOff, id);
    if (!original) throw notFound('Signature');
    if (original.signer.id !== who.userId && who.role !== 'safety')
      throw forbidden(`Only ${original.signerName}, who signed it, or the safety officer can correct this record`);
    const signOff = await appendSignOff(tx, who, {
      meaning: 'correction',
      subjectType: original.subjectType,
      subjectId: original.subjectId,
      machineId: original.machine?.id ?? null,
      details: { summary: `Corrects #${original.seq} (${original.signerName}): ${note}`, correctsSeq: original.seq, correctsHash: original.hash },
      note,
      correctsId: original.id,
    });
    recordActivity(tx, who, 'safety.sign-off-corrected', { type: 'SafetySignOff', id: original.id }, { correctionId: signOff.id });
    return { id: signOff.id, seq: signOff.seq };
  });
}
