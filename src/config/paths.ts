/** Every route path in one place; `getHref` builds links so paths are never typed twice. */
export const paths = {
  home: { path: '/', getHref: () => '/' },
  signIn: { path: '/sign-in', getHref: (redirectTo?: string) => `/sign-in${redirectTo ? `?redirectTo=${encodeURIComponent(redirectTo)}` : ''}` },
  forgotPassword: { path: '/forgot-password', getHref: () => '/forgot-password' },
  acceptInvite: { path: '/accept-invite', getHref: () => '/accept-invite' },
  resetPassword: { path: '/reset-password', getHref: () => '/reset-password' },
  users: { path: '/admin/users', getHref: () => '/admin/users' },
  audit: { path: '/admin/audit', getHref: () => '/admin/audit' },
  devInbox: { path: '/dev/inbox', getHref: () => '/dev/inbox' },
  machines: { path: '/machines', getHref: () => '/machines' },
  machine: { path: '/machines/:id', getHref: (id: string) => `/machines/${id}` },
  meter: { path: '/meters/:id', getHref: (id: string) => `/meters/${id}` },
  counterImport: { path: '/counter-import', getHref: () => '/counter-import' },
  stock: { path: '/stock', getHref: () => '/stock' },
  station: { path: '/station/:code', getHref: (code: string) => `/station/${encodeURIComponent(code)}` },
  stationLabel: { path: '/station/:code/label', getHref: (code: string) => `/station/${encodeURIComponent(code)}/label` },
  consumableLife: { path: '/consumable-life', getHref: () => '/consumable-life' },
} as const;
