import type { ReactNode } from 'react';
import type { Role } from '../../../../shared/permissions';

const headline: Record<Role, { title: string; lead: string }> = {
  operator: { title: 'At the machine', lead: 'Log consumable changes and counter readings, do your shift’s PPE check, and see what is due on your machine.' },
  technician: { title: 'Work to do', lead: 'Work orders raised for you, lockouts in progress, stock to keep.' },
  safety: { title: 'Safety programme', lead: 'Procedures to approve, inspections to certify, sign-offs to audit.' },
  admin: { title: 'Shop overview', lead: 'People, machines, plans and site settings.' },
};

export function RoleHome({ role, name, children }: { role: Role; name: string; children: ReactNode }) {
  const h = headline[role];
  return (
    <div className="space-y-4">
      <div>
        <p className="text-sm font-semibold uppercase tracking-wider text-steel-600">{h.title}</p>
        <h1 className="text-2xl font-bold md:text-3xl">Hello, {name.split(' ')[0]}</h1>
        <p className="text-steel-700">{h.lead}</p>
      </div>
      <div className="grid gap-4 lg:grid-cols-2">{children}</div>
    </div>
  );
}
