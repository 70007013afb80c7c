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
} as const;
