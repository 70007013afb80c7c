import { compactShopChanges } from '../server/modules/shop-changes/shop-revision';
import type { EntityManager } from '@mikro-orm/postgresql';
import { Organization } from '../server/modules/organizations/organization.entity';
import { createMember, createShop } from './factories';
import { seedMachines } from './demo-machines';
import { seedSafetyDemo } from './demo-safety';
import { seedPlansDemo } from './demo-plans';
import { seedStopsDemo } from './demo-stops';

/** The invented demo shops. Every name here is made up; e-mail domains are `.example`. */
export const DEMO_USERS = [
  { email: 'admin@alder-row.example', name: 'Rhea Castellan', role: 'admin' },
  { email: 'safety@alder-row.example', name: 'Tomas Verhoek', role: 'safety' },
  { email: 'tech@alder-row.example', name: 'Imani Oduya', role: 'technician' },
  { email: 'operator@alder-row.example', name: 'Dario Fenwick', role: 'operator' },
] as const;

/** What the demo needs from the configuration: the base of the links in the mails its passes queue. */
export type DemoSettings = { appUrl: string };
export type SeedStep = (em: EntityManager, shop: { id: string; timeZone: string }, settings?: DemoSettings) => Promise<void>;
/** Feature modules add their demo data here (machines, history …). */
export const demoSteps: SeedStep[] = [];
// Machines, meters and consumable history first: later steps attach to these machines.
demoSteps.push(seedMachines);
// Plans and their work history: after the machines, found by code.
demoSteps.push(seedPlansDemo);
// A year of coded stops for the reliability page.
demoSteps.push(seedStopsDemo);

export async function seedDemo(em: EntityManager, settings: DemoSettings): Promise<boolean> {
  if (await em.findOne(Organization, { slug: 'alder-row' }, { filters: false })) return false;
  const alder = await createShop(em, { name: 'Alder Row Sheetworks', slug: 'alder-row', timeZone: 'America/Chicago' });
  for (const u of DEMO_USERS) await createMember(em, alder, u);
  const birch = await createShop(em, { name: 'Birch Yard Fabrication', slug: 'birch-yard', timeZone: 'Europe/Berlin' });
  await createMember(em, birch, { email: 'admin@birch-yard.example', name: 'Saoirse Lindqvist', role: 'admin' });
  for (const step of demoSteps) await step(em, alder, settings);
  // Thousands of seeding statements each left a change row; the first request should not sum them all.
  await compactShopChanges(em);
  return true;
}

// Keep last: the safety history attaches to the machines the steps above create.
demoSteps.push(seedSafetyDemo);
