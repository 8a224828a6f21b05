import { createBrowserRouter, RouterProvider } from 'react-router-dom';
import { AppShell } from '../components/layout/app-shell';
import { RouteError } from './routes/route-error';
import { paths } from '../config/paths';

const router = createBrowserRouter([
  {
    path: '/',
    element: <AppShell />,
    errorElement: <RouteError />,
    children: [
      { path: paths.home.path, lazy: () => import('./routes/home').then((m) => ({ Component: m.HomeRoute })) },
      { path: '*', lazy: () => import('./routes/not-found').then((m) => ({ Component: m.NotFoundRoute })) },
    ],
  },
]);

/** The client's routes; each screen is its own lazily loaded module. */
export function AppRouter() {
  return <RouterProvider router={router} />;
}
