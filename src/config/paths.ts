/** Every route path in one place; `getHref` builds links so paths are never typed twice. */
export const paths = {
  home: { path: '/', getHref: () => '/' },
  reliability: {
    path: '/reliability',
    getHref: (machineId?: string) => `/reliability${machineId ? `?machine=${machineId}` : ''}`,
  },
  signIn: { path: '/sign-in', getHref: (redirectTo?: string) => `/sign-in${redirectTo ? `?redirectTo=${encodeURIComponent(redirectTo)}` : ''}` },
  forgotPassword: { path: '/forgot-password', getHref: () => '/forgot-password' },
  acceptInvite: { path: '/accept-invite', getHref: () => '/accept-invite' },
  resetPassword: { path: '/reset-password', getHref: () => '/reset-password' },
  users: { path: '/admin/users', getHref: () => '/admin/users' },
  siteSettings: { path: '/admin/settings', getHref: () => '/admin/settings' },
  activityLog: { path: '/admin/audit', getHref: () => '/admin/audit' },
  devInbox: { path: '/dev/inbox', getHref: () => '/dev/inbox' },
  safety: { path: '/safety', getHref: () => '/safety' },
  safetyProcedures: { path: '/safety/procedures', getHref: () => '/safety/procedures' },
  safetyProcedureNew: {
    path: '/safety/procedures/new',
    getHref: (machineId?: string) => `/safety/procedures/new${machineId ? `?machineId=${machineId}` : ''}`,
  },
  safetyProcedure: {
    path: '/safety/procedures/:id',
    getHref: (id: string, version?: number) => `/safety/procedures/${id}${version ? `?version=${version}` : ''}`,
  },
  safetyProcedureEdit: { path: '/safety/procedures/:id/edit', getHref: (id: string) => `/safety/procedures/${id}/edit` },
  safetyLockouts: { path: '/safety/lockouts', getHref: () => '/safety/lockouts' },
  safetyLockoutNew: {
    path: '/safety/lockouts/new',
    getHref: (o: { machineId?: string; workOrderId?: string } = {}) =>
      `/safety/lockouts/new${o.machineId || o.workOrderId ? `?${new URLSearchParams(Object.entries(o).filter(([, v]) => v) as [string, string][]).toString()}` : ''}`,
  },
  safetyLockout: { path: '/safety/lockouts/:id', getHref: (id: string) => `/safety/lockouts/${id}` },
  safetyPpe: {
    path: '/safety/ppe',
    /** `back`: the station to return to once the check is signed. */
    getHref: (machineId?: string, back?: string) => {
      const q = new URLSearchParams(Object.entries({ machineId, back }).filter(([, v]) => v) as [string, string][]).toString();
      return `/safety/ppe${q ? `?${q}` : ''}`;
    },
  },
  safetyPpeRequirements: { path: '/safety/ppe/requirements', getHref: () => '/safety/ppe/requirements' },
  safetyRecords: { path: '/safety/records', getHref: () => '/safety/records' },
  safetyHotWork: { path: '/safety/hot-work', getHref: () => '/safety/hot-work' },
  safetyAudit: { path: '/safety/audit', getHref: () => '/safety/audit' },
  safetyLocks: { path: '/safety/locks', getHref: () => '/safety/locks' },
  safetyEvents: { path: '/safety/events', getHref: () => '/safety/events' },
  safetySettings: { path: '/safety/settings', getHref: () => '/safety/settings' },
  machines: { path: '/machines', getHref: () => '/machines' },
  machine: { path: '/machines/:id', getHref: (id: string) => `/machines/${id}` },
  meter: { path: '/meters/:id', getHref: (id: string) => `/meters/${id}` },
  counterImport: { path: '/counter-import', getHref: () => '/counter-import' },
  stock: { path: '/stock', getHref: () => '/stock' },
  purchasing: { path: '/purchasing', getHref: () => '/purchasing' },
  station: { path: '/station/:code', getHref: (code: string) => `/station/${encodeURIComponent(code)}` },
  stationPreUseCheck: { path: '/station/:code/pre-use-check', getHref: (code: string) => `/station/${encodeURIComponent(code)}/pre-use-check` },
  stationLabel: { path: '/station/:code/label', getHref: (code: string) => `/station/${encodeURIComponent(code)}/label` },
  consumableLife: { path: '/consumable-life', getHref: () => '/consumable-life' },
  workOrders: { path: '/work-orders', getHref: (q?: Record<string, string>) => `/work-orders${q ? `?${new URLSearchParams(q).toString()}` : ''}` },
  workOrder: { path: '/work-orders/:id', getHref: (id: string) => `/work-orders/${id}` },
  plans: { path: '/plans', getHref: () => '/plans' },
  planNew: { path: '/plans/new', getHref: () => '/plans/new' },
  plan: { path: '/plans/:id', getHref: (id: string) => `/plans/${id}` },
  planEdit: { path: '/plans/:id/edit', getHref: (id: string) => `/plans/${id}/edit` },
  oilAnalysis: { path: '/oil-analysis', getHref: () => '/oil-analysis' },
  jobRuns: { path: '/admin/job-runs', getHref: () => '/admin/job-runs' },
  myNotices: { path: '/my-notices', getHref: () => '/my-notices' },
} as const;
