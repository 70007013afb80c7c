/** How each person wants to hear of routine work (each notice or a daily summary). */
import type { EntityManager } from '@mikro-orm/postgresql';
import { NotifyPreference } from './work-order.entity';
import type { Principal } from '../../http/principal';
import { recordActivity } from '../activity-log/activity-log.service';
import type { NotifyPreference as NotifyPreferenceView, NotifyPreferenceInput } from '../../../shared/schemas/work-orders';

export async function getNotifyPreference(em: EntityManager, who: Principal): Promise<NotifyPreferenceView> {
  const p = await em.findOne(NotifyPreference, { user: who.userId });
  return { mode: p?.mode ?? 'immediate', digestHour: p?.digestHour ?? 6, timeZone: who.timeZone };
}

export async function setNotifyPreference(em: EntityManager, who: Principal, input: NotifyPreferenceInput): Promise<NotifyPreferenceView> {
  await em.transactional(async (tx) => {
    const p = await tx.findOne(NotifyPreference, { user: who.userId });
    if (p) {
      p.mode = input.mode;
      p.digestHour = input.digestHour;
    } else {
      tx.create(NotifyPreference, { organization: who.orgId, user: who.userId, mode: input.mode, digestHour: input.digestHour });
    }
    recordActivity(tx, who, 'notices.preference', { type: 'User', id: who.userId }, input);
  });
  return getNotifyPreference(em, who);
}
