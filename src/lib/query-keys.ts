/**
 * The first element of every query key, one per client feature (and one for the lookups two
 * features share). A feature builds its keys on its root in its own `api/keys.ts`; a feature
 * whose change shows on another feature's page (a logged consumable change moves stock)
 * invalidates that root from here, because features do not import each other.
 */
export const queryRoots = {
  activityLog: ['activity-log'],
  auth: ['auth'],
  calendarFeed: ['calendar-feed'],
  consumableLife: ['consumable-life'],
  cutChecks: ['cut-checks'],
  devInbox: ['dev-inbox'],
  jobRuns: ['job-runs'],
  lookups: ['lookups'],
  machines: ['machines'],
  machineState: ['machine-state'],
  meters: ['meters'],
  oilAnalysis: ['oil-analysis'],
  orgSettings: ['org-settings'],
  plans: ['plans'],
  punchTools: ['punch-tools'],
  purchasing: ['purchasing'],
  safety: ['safety'],
  station: ['station'],
  stock: ['stock'],
  users: ['users'],
  workOrders: ['work-orders'],
} as const;
