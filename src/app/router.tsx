import { createBrowserRouter, Navigate, RouterProvider, useRouteError } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import { authQueries } from '../features/auth/api';
import { ROLE_HOME } from '../../shared/roles';
import { ErrorPanel, Loading } from '../components/ui/states';
import { Shell } from './shell';

function Home() {
  const me = useQuery(authQueries.me());
  if (me.isPending) return <Loading what="your account" />;
  return <Navigate to={me.data ? ROLE_HOME[me.data.role] : '/sign-in'} replace />;
}

function RouteError() {
  const error = useRouteError();
  return (
    <div className="mx-auto max-w-3xl p-6">
      <ErrorPanel error={error instanceof Error ? error : new Error('This page could not be shown.')} retry={() => window.location.reload()} />
    </div>
  );
}

const router = createBrowserRouter([
  { path: '/sign-in', lazy: () => import('../features/auth/routes/sign-in').then((m) => ({ Component: m.SignInRoute })) },
  { path: '/setup', lazy: () => import('../features/auth/routes/setup').then((m) => ({ Component: m.SetupRoute })) },
  { path: '/invite/:token', lazy: () => import('../features/auth/routes/accept-invite').then((m) => ({ Component: m.AcceptInviteRoute })) },
  {
    element: <Shell />,
    errorElement: <RouteError />,
    children: [
      { index: true, element: <Home /> },
      { path: '/fleet', lazy: () => import('../features/fleet/routes/fleet-register').then((m) => ({ Component: m.FleetRegisterRoute })) },
      { path: '/fleet/new', lazy: () => import('../features/fleet/routes/bike-new').then((m) => ({ Component: m.BikeNewRoute })) },
      { path: '/fleet/:id', lazy: () => import('./routes/bike').then((m) => ({ Component: m.BikeRoute })) },
      { path: '/check-in', lazy: () => import('./routes/check-in').then((m) => ({ Component: m.CheckInWithPhotos })) },
      { path: '/this-week', lazy: () => import('./routes/this-week').then((m) => ({ Component: m.ThisWeekBoard })) },
      { path: '/tasks', lazy: () => import('../features/tasks/routes/tasks').then((m) => ({ Component: m.TasksRoute })) },
      { path: '/bookings', lazy: () => import('../features/bookings/routes/bookings').then((m) => ({ Component: m.BookingsRoute })) },
      { path: '/workshop', lazy: () => import('../features/workshop/routes/workshop').then((m) => ({ Component: m.WorkshopRoute })) },
      { path: '/plan', lazy: () => import('../features/plan/routes/plan-board').then((m) => ({ Component: m.PlanBoardRoute })) },
      { path: '/admin/mail', lazy: () => import('../features/mail/routes/mail').then((m) => ({ Component: m.MailRoute })) },
      { path: '/admin/mail/:id', lazy: () => import('../features/mail/routes/mail').then((m) => ({ Component: m.MailRoute })) },
      { path: '/admin/people', lazy: () => import('../features/admin/routes/people').then((m) => ({ Component: m.PeopleRoute })) },
      { path: '/admin/sites', lazy: () => import('../features/admin/routes/sites').then((m) => ({ Component: m.SitesRoute })) },
      { path: '/plans', lazy: () => import('../features/plans/routes/plans-list').then((m) => ({ Component: m.PlansRoute })) },
      { path: '/plans/new', lazy: () => import('../features/plans/routes/model-editor').then((m) => ({ Component: m.ModelNewRoute })) },
      { path: '/plans/:id', lazy: () => import('../features/plans/routes/model-editor').then((m) => ({ Component: m.ModelEditorRoute })) },
      { path: '/tasks/:id/valves', lazy: () => import('../features/valves/routes/valve-card').then((m) => ({ Component: m.ValveCardRoute })) },
      { path: '/valves', lazy: () => import('../features/valves/routes/fleet-valves').then((m) => ({ Component: m.FleetValvesRoute })) },
      { path: '/stock', lazy: () => import('../features/stock/routes/shim-stock').then((m) => ({ Component: m.ShimStockRoute })) },
      { path: '/parts', lazy: () => import('../features/parts/routes/parts-page').then((m) => ({ Component: m.PartsRoute })) },
      { path: '/import', lazy: () => import('../features/imports/routes/import').then((m) => ({ Component: m.ImportRoute })) },
      { path: '/fleet/:id/record', lazy: () => import('../features/records/routes/service-record').then((m) => ({ Component: m.ServiceRecordRoute })) },
      { path: '/admin/backup', lazy: () => import('../features/imports/routes/backup').then((m) => ({ Component: m.BackupRoute })) },
      { path: '/admin/settings', lazy: () => import('../features/settings/routes/settings').then((m) => ({ Component: m.SettingsRoute })) },
      { path: '*', element: <ErrorPanel error={new Error('There is no page at this address. Use the menu above.')} /> },
    ],
  },
]);

export function AppRouter() {
  return <RouterProvider router={router} />;
}
