import type { EntityManager } from '@mikro-orm/postgresql';
import type { Principal } from '../../http/principal';
import type { OrgSettingsInput } from '../../../shared/schemas/organization';
import { Organization } from './organization.entity';
import { recordActivity } from '../activity-log/activity-log.service';

export type ShopProfile = { id: string; name: string; timeZone: string };

/** The signed-in person's shop: its name and the zone every time is shown in. */
export async function getShopProfile(em: EntityManager, who: Pick<Principal, 'orgId'>): Promise<ShopProfile> {
  const org = await em.findOneOrFail(Organization, who.orgId);
  return { id: org.id, name: org.name, timeZone: org.timeZone };
}

export async function updateShopProfile(em: EntityManager, who: Principal, input: OrgSettingsInput): Promise<ShopProfile> {
  const org = await em.findOneOrFail(Organization, who.orgId);
  const before = { name: org.name, timeZone: org.timeZone };
  org.name = input.name;
  org.timeZone = input.timeZone;
  recordActivity(em, who, 'organization.updated', { type: 'Organization', id: org.id }, { before, after: input });
  await em.flush();
  return { id: org.id, name: org.name, timeZone: org.timeZone };
}
