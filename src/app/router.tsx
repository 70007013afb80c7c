import { createBrowserRouter, redirect, type LoaderFunctionArgs } from 'react-router-dom';
import { queryClient } from '../lib/query-client';
import { getMeQueryOptions } from '../features/auth/api/get-me';
import { paths } from '../config/paths';
import { RouteError } from './routes/route-error';

/** Shown while the first route's code and data load. */
function Splash() {
  return (
    <p role="status" className="p-6 text-lg font-semibold text-steel-700">
      Loading Kerfbook…
    </p>
  );
}
const top = { errorElement: <RouteError />, hydrateFallbackElement: <Splash /> };

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
  { path: paths.signIn.path, lazy: () => import('./routes/sign-in'), ...top },
  { path: paths.forgotPassword.path, lazy: () => import('./routes/forgot-password'), ...top },
  { path: paths.acceptInvite.path, lazy: () => import('./routes/accept-invite'), ...top },
  { path: paths.resetPassword.path, lazy: () => import('./routes/reset-password'), ...top },
  {
    path: '/',
    loader: requireSignIn,
    lazy: () => import('./routes/app-layout'),
    ...top,
    children: [
      { index: true, lazy: () => import('./routes/home') },
      { path: paths.users.path.slice(1), lazy: () => import('./routes/admin-users') },
      { path: paths.siteSettings.path.slice(1), lazy: () => import('./routes/admin-settings') },
      { path: paths.activityLog.path.slice(1), lazy: () => import('./routes/activity-log') },
      { path: paths.devInbox.path.slice(1), lazy: () => import('./routes/dev-inbox') },
      { path: paths.safety.path.slice(1), lazy: () => import('./routes/safety') },
      { path: paths.safetyProcedures.path.slice(1), lazy: () => import('./routes/safety-procedures') },
      { path: paths.safetyProcedureNew.path.slice(1), lazy: () => import('./routes/safety-procedures-edit') },
      { path: paths.safetyProcedure.path.slice(1), lazy: () => import('./routes/safety-procedures-detail') },
      { path: paths.safetyProcedureEdit.path.slice(1), lazy: () => import('./routes/safety-procedures-edit') },
      { path: paths.safetyLockouts.path.slice(1), lazy: () => import('./routes/safety-lockouts') },
      { path: paths.safetyLockoutNew.path.slice(1), lazy: () => import('./routes/safety-lockouts-new') },
      { path: paths.safetyLockout.path.slice(1), lazy: () => import('./routes/safety-lockouts-detail') },
      { path: paths.safetyPpe.path.slice(1), lazy: () => import('./routes/safety-ppe') },
      { path: paths.safetyPpeRequirements.path.slice(1), lazy: () => import('./routes/safety-ppe-requirements') },
      { path: paths.safetyRecords.path.slice(1), lazy: () => import('./routes/safety-records') },
      { path: paths.safetyHotWork.path.slice(1), lazy: () => import('./routes/safety-hot-work') },
      { path: paths.safetyAudit.path.slice(1), lazy: () => import('./routes/safety-audit') },
      { path: paths.safetyLocks.path.slice(1), lazy: () => import('./routes/safety-locks') },
      { path: paths.safetyEvents.path.slice(1), lazy: () => import('./routes/safety-events') },
      { path: paths.safetySettings.path.slice(1), lazy: () => import('./routes/safety-settings') },
      { path: paths.machines.path.slice(1), lazy: () => import('./routes/machines') },
      { path: paths.reliability.path.slice(1), lazy: () => import('./routes/reliability') },
      { path: paths.machine.path.slice(1), lazy: () => import('./routes/machines-detail') },
      { path: paths.meter.path.slice(1), lazy: () => import('./routes/meters-detail') },
      { path: paths.counterImport.path.slice(1), lazy: () => import('./routes/counter-import') },
      { path: paths.stock.path.slice(1), lazy: () => import('./routes/stock') },
      { path: paths.purchasing.path.slice(1), lazy: () => import('./routes/purchasing') },
      { path: paths.station.path.slice(1), lazy: () => import('./routes/station') },
      { path: paths.stationLabel.path.slice(1), lazy: () => import('./routes/station-label') },
      { path: paths.stationPreUseCheck.path.slice(1), lazy: () => import('./routes/safety-pre-use-check') },
      { path: paths.consumableLife.path.slice(1), lazy: () => import('./routes/consumable-life') },
      { path: paths.workOrders.path.slice(1), lazy: () => import('./routes/work-orders') },
      { path: paths.workOrder.path.slice(1), lazy: () => import('./routes/work-orders-detail') },
      { path: paths.plans.path.slice(1), lazy: () => import('./routes/plans') },
      { path: paths.planNew.path.slice(1), lazy: () => import('./routes/plans-new') },
      { path: paths.plan.path.slice(1), lazy: () => import('./routes/plans-detail') },
      { path: paths.planEdit.path.slice(1), lazy: () => import('./routes/plans-edit') },
      { path: paths.oilAnalysis.path.slice(1), lazy: () => import('./routes/oil-analysis') },
      { path: paths.jobRuns.path.slice(1), lazy: () => import('./routes/job-runs') },
      { path: paths.myNotices.path.slice(1), lazy: () => import('./routes/work-orders-notices') },
      { path: '*', lazy: () => import('./routes/not-found') },
    ],
  },
]);
