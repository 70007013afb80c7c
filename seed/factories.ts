import type { EntityManager } from '@mikro-orm/postgresql';
import { Organization } from '../server/modules/organizations/organization.entity';
import { Membership, User } from '../server/modules/users/user.entity';
import { hashPassword } from '../server/modules/auth/passwords';
import type { Role } from '../shared/permissions';

export const DEMO_PASSWORD = 'kerfbook-demo';

export async function createShop(em: EntityManager, input: { name: string; slug: string; timeZone?: string }) {
  const org = em.create(Organization, { name: input.name, slug: input.slug, timeZone: input.timeZone ?? 'America/Chicago', settings: {} });
  await em.flush();
  return org;
}

let cachedDemoHash: string | null = null;

/** A user with a membership; the demo password's hash is computed once per process. */
export async function createMember(
  em: EntityManager,
  org: { id: string },
  input: { email: string; name: string; role: Role; password?: string; active?: boolean },
) {
  const passwordHash =
    input.password && input.password !== DEMO_PASSWORD ? await hashPassword(input.password) : (cachedDemoHash ??= await hashPassword(DEMO_PASSWORD));
  const user = em.create(User, { email: input.email.toLowerCase(), name: input.name, passwordHash });
  const membership = em.create(Membership, { user, organization: org.id, role: input.role, active: input.active ?? true });
  await em.flush();
  return { user, membership };
}
