import { createBrowserRouter } from 'react-router-dom';
import { FullPageLoading, RootErrorBoundary } from './routes/route-error';

/**
 * The route table. Every screen is its own lazily loaded module in routes/ exporting `Component`,
 * `loader` (which fetches early with queryClient.ensureQueryData) and `ErrorBoundary`.
 */
export function createAppRouter() {
  return createBrowserRouter([
    { path: '/sign-in', lazy: () => import('./routes/sign-in'), HydrateFallback: FullPageLoading },
    {
      id: 'app',
      path: '/',
      lazy: () => import('./routes/app-layout'),
      ErrorBoundary: RootErrorBoundary,
      HydrateFallback: FullPageLoading,
      children: [
        { index: true, lazy: () => import('./routes/today') },
        { path: 'cylinder-check', lazy: () => import('./routes/cylinder-check') },
        { path: 'sources', lazy: () => import('./routes/current-site-redirect') },
        { path: 'sources/:id', lazy: () => import('./routes/source-detail') },
        { path: 'sites/:siteId/sources', lazy: () => import('./routes/sources') },
        { path: 'wards', lazy: () => import('./routes/current-site-redirect') },
        { path: 'wards/:id', lazy: () => import('./routes/ward-detail') },
        { path: 'sites/:siteId/wards', lazy: () => import('./routes/wards') },
        { path: 'capacity', lazy: () => import('./routes/capacity') },
        { path: 'capacity/rule-sets', lazy: () => import('./routes/capacity/rule-sets') },
        { path: 'capacity/signoffs/:signoffId', lazy: () => import('./routes/capacity/signoff') },
        { path: 'orders', lazy: () => import('./routes/orders/requests') },
        { path: 'orders/requests/:id', lazy: () => import('./routes/orders/request') },
        { path: 'orders/purchase-orders', lazy: () => import('./routes/orders/purchase-orders') },
        { path: 'orders/purchase-orders/:id', lazy: () => import('./routes/orders/purchase-order') },
        { path: 'orders/spend', lazy: () => import('./routes/orders/spend') },
        { path: 'report', lazy: () => import('./routes/report') },
        { path: 'uploads', lazy: () => import('./routes/uploads') },
        { path: 'reconciliation', lazy: () => import('./routes/reconciliation') },
        { path: 'account', lazy: () => import('./routes/account') },
        { path: 'admin/sites', lazy: () => import('./routes/admin/sites') },
        { path: 'admin/users', lazy: () => import('./routes/admin/users') },
        { path: 'admin/cylinder-types', lazy: () => import('./routes/admin/cylinder-types') },
        { path: 'admin/suppliers', lazy: () => import('./routes/admin/suppliers') },
        { path: 'admin/audit', lazy: () => import('./routes/admin/audit') },
        { path: 'admin/mail', lazy: () => import('./routes/admin/mail') },
        { path: 'admin/mail/:messageId', lazy: () => import('./routes/admin/mail-message') },
        { path: 'admin/outbox', lazy: () => import('./routes/admin/outbox') },
        { path: '*', lazy: () => import('./routes/not-found') },
      ],
    },
  ]);
}

export type AppRouter = ReturnType<typeof createAppRouter>;
