import type { NavItem } from '../components/layout/app-shell';
import { can, type Permission, type Role } from '../../shared/permissions';
import { paths } from '../config/paths';

/** Menu entries and who sees them; the same permission table the server enforces. */
// `for`: whose menu shows it (the page stays reachable for anyone the permission allows);
// it keeps the operator's menu short enough to use with gloves on.
const office: Role[] = ['technician', 'safety', 'admin'];
const items: (NavItem & { permission?: Permission; for?: Role[] })[] = [
  { to: paths.home.getHref(), label: 'Today', end: true },
  { to: paths.workOrders.getHref(), label: 'Work orders', permission: 'work-orders.read' },
  { to: paths.plans.getHref(), label: 'Plans', permission: 'plans.read', for: office },
  { to: paths.machines.getHref(), label: 'Machines', permission: 'machines.read' },
  { to: paths.counterImport.getHref(), label: 'Counter import', permission: 'readings.import' },
  { to: paths.stock.getHref(), label: 'Stock', permission: 'stock.read', for: ['technician', 'admin'] },
  { to: paths.consumableLife.getHref(), label: 'Consumable life', permission: 'machines.read', for: office },
  { to: paths.safety.getHref(), label: 'Safety', permission: 'safety.read', end: true },
  { to: paths.safetyPpe.getHref(), label: 'PPE check', permission: 'safety.ppe.sign', end: true },
  { to: paths.safetyAudit.getHref(), label: 'Safety audit', permission: 'safety.audit' },
  { to: paths.users.getHref(), label: 'People', permission: 'users.read' },
  { to: paths.siteSettings.getHref(), label: 'Site settings', permission: 'org.settings.manage' },
  { to: paths.audit.getHref(), label: 'Activity', permission: 'audit.read' },
  { to: paths.oilAnalysis.getHref(), label: 'Oil analysis', permission: 'oil.read', for: ['technician', 'admin'] },
  { to: paths.jobRuns.getHref(), label: 'Pass log', permission: 'jobs.run' },
  { to: paths.myNotices.getHref(), label: 'My notices' },
  { to: paths.devInbox.getHref(), label: 'Dev inbox', permission: 'mail.inbox.own' },
];

export const navFor = (role: Role): NavItem[] => items.filter((i) => (!i.permission || can(role, i.permission)) && (!i.for || i.for.includes(role)));
