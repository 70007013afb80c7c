import type { NavItem } from '../components/layout/app-shell';
import { can, type Permission, type Role } from '../../shared/permissions';
import { paths } from '../config/paths';

/** Menu entries and who sees them; the same permission table the server enforces. */
// `for`: whose menu shows it (the page stays reachable for anyone the permission allows);
// it keeps the operator's menu short enough to use with gloves on.
// `group`: pages reached through one menu entry and tabs on those pages, so a long menu stays one row.
// `personal`: the person's own pages, set apart at the end of the menu.
type Entry = NavItem & { permission?: Permission; for?: Role[]; group?: string };
const office: Role[] = ['technician', 'safety', 'admin'];
const ADMIN = 'Shop admin';
const items: Entry[] = [
  { to: paths.home.getHref(), label: 'Today', end: true },
  { to: paths.workOrders.getHref(), label: 'Work orders', permission: 'work-orders.read' },
  { to: paths.plans.getHref(), label: 'Plans', permission: 'plans.read', for: office },
  { to: paths.machines.getHref(), label: 'Machines', permission: 'machines.read' },
  { to: paths.counterImport.getHref(), label: 'Counter import', permission: 'readings.import' },
  { to: paths.stock.getHref(), label: 'Stock', permission: 'stock.read', for: ['technician', 'admin'] },
  { to: paths.purchasing.getHref(), label: 'Purchasing', permission: 'purchasing.read' },
  { to: paths.consumableLife.getHref(), label: 'Consumable life', permission: 'machines.read', for: office },
  { to: paths.reliability.getHref(), label: 'Reliability', permission: 'machines.read', for: office },
  { to: paths.oilAnalysis.getHref(), label: 'Oil analysis', permission: 'oil.read', for: ['technician', 'admin'] },
  { to: paths.safety.getHref(), label: 'Safety', permission: 'safety.read', end: true },
  { to: paths.safetyPpe.getHref(), label: 'PPE check', permission: 'safety.ppe.sign', end: true },
  { to: paths.safetyAudit.getHref(), label: 'Safety audit', permission: 'safety.audit' },
  { to: paths.users.getHref(), label: 'People', permission: 'users.read', group: ADMIN },
  { to: paths.siteSettings.getHref(), label: 'Site settings', permission: 'org.settings.manage', group: ADMIN },
  { to: paths.activityLog.getHref(), label: 'Activity', permission: 'activity-log.read', group: ADMIN },
  { to: paths.jobRuns.getHref(), label: 'Pass log', permission: 'jobs.run', group: ADMIN },
  { to: paths.myNotices.getHref(), label: 'My notices', personal: true },
  { to: paths.devInbox.getHref(), label: 'Dev inbox', permission: 'mail.inbox.own', personal: true },
];

/**
 * The menu for a role. A group with two or more pages the role may open becomes one entry (leading
 * to its first page) whose pages show as tabs; a group of one is an ordinary entry.
 */
export function navFor(role: Role): NavItem[] {
  const mine = items.filter((i) => (!i.permission || can(role, i.permission)) && (!i.for || i.for.includes(role)));
  const out: NavItem[] = [];
  for (const { permission: _p, for: _f, group, ...item } of mine) {
    if (!group) {
      out.push(item);
      continue;
    }
    const members = mine.filter((i) => i.group === group).map(({ permission: _a, for: _b, group: _c, ...m }) => m);
    if (members.length < 2) out.push(item);
    else if (members[0].to === item.to) out.push({ to: item.to, label: group, children: members });
  }
  return out;
}
