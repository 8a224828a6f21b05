import { createBrowserRouter, RouterProvider } from 'react-router-dom';
import { AppShell } from '../components/layout/app-shell';
import { RouteError } from './routes/route-error';
import { paths } from '../config/paths';
import { requireSession } from '../features/auth/session-guard';

const router = createBrowserRouter([
  {
    path: paths.signIn.path,
    errorElement: <RouteError />,
    lazy: () => import('./routes/sign-in').then((m) => ({ Component: m.SignInRoute, loader: m.loader })),
  },
  {
    path: paths.forgotPassword.path,
    errorElement: <RouteError />,
    lazy: () => import('./routes/forgot-password').then((m) => ({ Component: m.ForgotPasswordRoute })),
  },
  {
    path: paths.setPassword.path,
    errorElement: <RouteError />,
    lazy: () => import('./routes/set-password').then((m) => ({ Component: m.SetPasswordRoute })),
  },
  {
    path: '/',
    element: <AppShell />,
    errorElement: <RouteError />,
    // Every screen inside the shell needs a session; anonymous visitors go to sign-in and come back.
    loader: requireSession,
    children: [
      { path: paths.home.path, lazy: () => import('./routes/home').then((m) => ({ Component: m.HomeRoute })) },
      { path: paths.scan.path, lazy: () => import('./routes/scan').then((m) => ({ Component: m.ScanRoute })) },
      { path: paths.orders.path, lazy: () => import('./routes/orders').then((m) => ({ Component: m.OrdersRoute })) },
      { path: paths.orderNew.path, lazy: () => import('./routes/order-new').then((m) => ({ Component: m.OrderNewRoute })) },
      { path: paths.order.path, lazy: () => import('./routes/order').then((m) => ({ Component: m.OrderRoute, loader: m.loader })) },
      { path: paths.customers.path, lazy: () => import('./routes/customers').then((m) => ({ Component: m.CustomersRoute })) },
      { path: paths.customer.path, lazy: () => import('./routes/customer').then((m) => ({ Component: m.CustomerRoute, loader: m.loader })) },
      { path: paths.heats.path, lazy: () => import('./routes/heats').then((m) => ({ Component: m.HeatsRoute })) },
      { path: paths.heat.path, lazy: () => import('./routes/heat').then((m) => ({ Component: m.HeatRoute, loader: m.loader })) },
      { path: paths.samples.path, lazy: () => import('./routes/samples').then((m) => ({ Component: m.SamplesRoute })) },
      { path: paths.sample.path, lazy: () => import('./routes/sample').then((m) => ({ Component: m.SampleRoute, loader: m.loader })) },
      { path: paths.specimens.path, lazy: () => import('./routes/specimens').then((m) => ({ Component: m.SpecimensRoute })) },
      { path: paths.specimen.path, lazy: () => import('./routes/specimen').then((m) => ({ Component: m.SpecimenRoute, loader: m.loader })) },
      { path: paths.labels.path, lazy: () => import('./routes/labels').then((m) => ({ Component: m.LabelsRoute })) },
      { path: paths.account.path, lazy: () => import('./routes/account').then((m) => ({ Component: m.AccountRoute })) },
      { path: paths.users.path, lazy: () => import('./routes/users').then((m) => ({ Component: m.UsersRoute })) },
      { path: paths.stations.path, lazy: () => import('./routes/stations').then((m) => ({ Component: m.StationsRoute })) },
      { path: paths.outbox.path, lazy: () => import('./routes/outbox').then((m) => ({ Component: m.OutboxRoute })) },
      { path: paths.store.path, lazy: () => import('./routes/store').then((m) => ({ Component: m.StoreRoute })) },
      { path: paths.retention.path, lazy: () => import('./routes/retention').then((m) => ({ Component: m.RetentionRoute })) },
      { path: paths.holds.path, lazy: () => import('./routes/holds').then((m) => ({ Component: m.HoldsRoute })) },
      { path: paths.disposals.path, lazy: () => import('./routes/disposals').then((m) => ({ Component: m.DisposalsRoute })) },
      { path: paths.trace.path, lazy: () => import('./routes/trace').then((m) => ({ Component: m.TraceRoute })) },
      { path: paths.anomalies.path, lazy: () => import('./routes/anomalies').then((m) => ({ Component: m.AnomaliesRoute })) },
      { path: paths.results.path, lazy: () => import('./routes/results').then((m) => ({ Component: m.ResultsRoute })) },
      { path: paths.resultsOrder.path, lazy: () => import('./routes/results-order').then((m) => ({ Component: m.ResultsOrderRoute })) },
      { path: paths.resultsSpecimen.path, lazy: () => import('./routes/results-specimen').then((m) => ({ Component: m.ResultsSpecimenRoute })) },
      { path: paths.specifications.path, lazy: () => import('./routes/specifications').then((m) => ({ Component: m.SpecificationsRoute })) },
      { path: '*', lazy: () => import('./routes/not-found').then((m) => ({ Component: m.NotFoundRoute })) },
    ],
  },
]);

/** The client's routes; each screen is its own lazily loaded module. */
export function AppRouter() {
  return <RouterProvider router={router} />;
}
