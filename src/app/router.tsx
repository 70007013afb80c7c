import { createBrowserRouter, redirect, type LoaderFunctionArgs } from 'react-router-dom';
import { queryClient } from '../lib/query-client';
import { getMeQueryOptions } from '../features/auth/api/get-me';
import { paths } from '../config/paths';
import { RouteError } from './routes/route-error';

/** Signed-in pages: the loader sends anyone without a session to sign-in. */
async function requireSignIn({ request }: LoaderFunctionArgs) {
  const me = await queryClient.ensureQueryData(getMeQueryOptions());
  if (!me) {
    const url = new URL(request.url);
    throw redirect(paths.signIn.getHref(url.pathname + url.search));
  }
  return null;
}

export const router = createBrowserRouter([
  { path: paths.signIn.path, lazy: () => import('./routes/sign-in'), errorElement: <RouteError /> },
  { path: paths.forgotPassword.path, lazy: () => import('./routes/forgot-password'), errorElement: <RouteError /> },
  { path: paths.acceptInvite.path, lazy: () => import('./routes/accept-invite'), errorElement: <RouteError /> },
  { path: paths.resetPassword.path, lazy: () => import('./routes/reset-password'), errorElement: <RouteError /> },
  {
    path: '/',
    loader: requireSignIn,
    lazy: () => import('./routes/app-layout'),
    errorElement: <RouteError />,
    children: [
      { index: true, lazy: () => import('./routes/home') },
      { path: paths.users.path.slice(1), lazy: () => import('./routes/admin-users') },
      { path: paths.audit.path.slice(1), lazy: () => import('./routes/audit') },
      { path: paths.devInbox.path.slice(1), lazy: () => import('./routes/dev-inbox') },
      { path: '*', lazy: () => import('./routes/not-found') },
    ],
  },
]);
