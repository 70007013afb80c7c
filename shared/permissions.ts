/**
 * Who may do what. The server enforces this table on every API route (the authority);
 * the client reads the same table to decide which menus and buttons to show.
 */
export const ROLES = ['operator', 'technician', 'safety', 'admin'] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  operator: 'Operator',
  technician: 'Maintenance technician',
  safety: 'Safety officer',
  admin: 'Admin',
};

const everyone = ROLES;

export const PERMISSIONS = {
  'users.read': ['admin'],
  'users.manage': ['admin'],
  'activity-log.read': ['admin', 'safety'],
  'org.settings.manage': ['admin'],
  'jobs.run': ['admin'],
  /** Captured mail of the shop's members, except password-reset links (those only their owner reads). */
  'mail.inbox.shop': ['admin'],
  'mail.inbox.own': everyone,
  // Maintenance: everyone sees plans and work; admins write plans; technicians (and the safety officer) do the work.
  'plans.read': everyone,
  'plans.manage': ['admin'],
  'work-orders.read': everyone,
  'work-orders.raise': everyone,
  'work-orders.work': ['technician', 'safety', 'admin'],
  'oil.read': everyone,
  'oil.record': ['technician', 'admin'],
  // Machines, meters, consumables: everyone reads; operators log at the machine, technicians keep records and stock.
  'machines.read': everyone,
  'machines.manage': ['admin', 'technician'],
  /** Taking a machine out of service or back by hand (an operator stops one by reporting a fault). */
  'machines.state': ['technician', 'safety', 'admin'],
  /** The signed pre-use check at the start of a shift, by whoever runs the machine. */
  'machines.pre-use.sign': ['operator', 'technician', 'safety'],
  'failure-codes.manage': ['technician', 'admin'],
  'meters.manage': ['admin', 'technician'],
  'readings.record': ['operator', 'technician', 'admin'],
  'readings.import': ['technician', 'admin'],
  'stock.read': everyone,
  'stock.manage': ['technician', 'admin'],
  // Purchasing: technicians (who see the shelves) raise requests and book what comes in; the admin approves and places orders.
  'purchasing.read': ['technician', 'admin'],
  'purchasing.suppliers': ['technician', 'admin'],
  'purchasing.request': ['technician', 'admin'],
  'purchasing.approve': ['admin'],
  'purchasing.order': ['admin'],
  'purchasing.receive': ['technician', 'admin'],
  'consumables.log': ['operator', 'technician', 'admin'],
  'tools.manage': ['technician', 'admin'],
  'cutchecks.record': ['operator', 'technician', 'admin'],
  // Safety log: the safety officer writes procedures and audits; technicians are the authorized employees who lock out.
  'safety.read': everyone,
  /** Technicians write and revise procedures for the machines they service; a safety officer approves (never their own draft). */
  'safety.procedures.draft': ['technician', 'safety'],
  'safety.procedures.manage': ['safety'],
  /** Removal of an absent employee's lock (1910.147(e)(3)): a supervisor runs the steps, the safety officer authorizes. */
  'safety.lockout.absent-removal': ['admin', 'technician', 'safety'],
  'safety.lockout.sign': ['technician', 'safety'],
  'safety.ppe.sign': ['operator', 'technician', 'safety'],
  'safety.ppe.manage': ['safety'],
  'safety.inspection.perform': ['technician', 'safety'],
  'safety.inspection.certify': ['safety'],
  'safety.training.manage': ['safety'],
  'safety.hotwork.sign': ['operator', 'technician', 'safety'],
  'safety.correct': ['operator', 'technician', 'safety'],
  /** Letting a machine run with a failed safety-critical check, signed with a reason. */
  'safety.deviation.sign': ['safety'],
  'safety.audit': ['safety', 'admin'],
  'safety.settings.manage': ['safety', 'admin'],
} as const satisfies Record<string, readonly Role[]>;

export type Permission = keyof typeof PERMISSIONS;

export function can(role: Role | null | undefined, permission: Permission): boolean {
  if (!role) return false;
  return (PERMISSIONS[permission] as readonly Role[]).includes(role);
}

export function rolesFor(permission: Permission): readonly Role[] {
  return PERMISSIONS[permission];
}
