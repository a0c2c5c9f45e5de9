import type { APIRequestContext } from 'playwright-core';

/**
 * Every screen of the front end, in one place, for the accessibility pass and the screenshots. A new
 * route in frontend/src/app/router.tsx must be added here: accessibility.test.ts fails until it is.
 * `route` is the router's pattern; `path` is where to go (for a pattern with an id, a function that
 * finds a real id of the demo organisation through the API, or null when there is none to show).
 */
export type DemoUser = 'facilities' | 'ward' | 'purchasing' | 'biomed' | 'admin';

export const DEMO_EMAIL: Record<DemoUser, string> = {
  facilities: 'facilities@plenum.example',
  ward: 'ward@plenum.example',
  purchasing: 'purchasing@plenum.example',
  biomed: 'biomed@plenum.example',
  admin: 'admin@plenum.example',
};
export const DEMO_PASSWORD = 'demo-plenum';

export interface Screen {
  name: string;
  route: string;
  as: DemoUser | null;
  path: string | ((api: Api) => Promise<string | null>);
}

/** JSON from the API with the signed-in page's cookies. */
export type Api = <T = any>(path: string) => Promise<T>;

export function apiOf(request: APIRequestContext, baseUrl: string): Api {
  return async (path) => {
    const res = await request.get(baseUrl + path);
    if (!res.ok()) throw new Error(`GET ${path}: ${res.status()}`);
    return res.json();
  };
}

const items = <T>(body: T[] | { items: T[] }): T[] => (Array.isArray(body) ? body : body.items);
const firstSite = async (api: Api) => ((await api('/api/auth/me')) as { sites: { id: number; kind?: string }[] }).sites[0].id;

export const SCREENS: Screen[] = [
  { name: 'sign-in', route: '/sign-in', as: null, path: '/sign-in' },
  { name: 'today', route: '/', as: 'facilities', path: '/' },
  { name: 'cylinder-check', route: 'cylinder-check', as: 'ward', path: '/cylinder-check' },
  { name: 'sources', route: 'sites/:siteId/sources', as: 'facilities', path: async (api) => `/sites/${await firstSite(api)}/sources` },
  {
    name: 'source-detail',
    route: 'sources/:id',
    as: 'facilities',
    path: async (api) => {
      const list = items<{ id: number }>(await api(`/api/sites/${await firstSite(api)}/sources`));
      return list.length ? `/sources/${list[0].id}` : null;
    },
  },
  { name: 'wards', route: 'sites/:siteId/wards', as: 'ward', path: async (api) => `/sites/${await firstSite(api)}/wards` },
  {
    name: 'ward-detail',
    route: 'wards/:id',
    as: 'ward',
    path: async (api) => {
      const list = items<{ id: number }>(await api(`/api/sites/${await firstSite(api)}/wards`));
      return list.length ? `/wards/${list[0].id}` : null;
    },
  },
  { name: 'capacity', route: 'capacity', as: 'biomed', path: '/capacity' },
  { name: 'capacity-rule-sets', route: 'capacity/rule-sets', as: 'biomed', path: '/capacity/rule-sets' },
  {
    name: 'capacity-signoff',
    route: 'capacity/signoffs/:signoffId',
    as: 'biomed',
    path: async (api) => {
      const list = items<{ id: number }>(await api(`/api/sites/${await firstSite(api)}/capacity/signoffs`));
      return list.length ? `/capacity/signoffs/${list[0].id}` : null;
    },
  },
  { name: 'orders-requests', route: 'orders', as: 'purchasing', path: '/orders' },
  {
    name: 'orders-request',
    route: 'orders/requests/:id',
    as: 'purchasing',
    path: async (api) => {
      const list = items<{ id: number }>(await api('/api/requests'));
      return list.length ? `/orders/requests/${list[0].id}` : null;
    },
  },
  { name: 'orders-purchase-orders', route: 'orders/purchase-orders', as: 'purchasing', path: '/orders/purchase-orders' },
  {
    name: 'orders-purchase-order',
    route: 'orders/purchase-orders/:id',
    as: 'purchasing',
    path: async (api) => {
      const list = items<{ id: number }>(await api('/api/orders'));
      return list.length ? `/orders/purchase-orders/${list[0].id}` : null;
    },
  },
  { name: 'orders-spend', route: 'orders/spend', as: 'purchasing', path: '/orders/spend' },
  { name: 'report', route: 'report', as: 'ward', path: '/report' },
  { name: 'uploads', route: 'uploads', as: 'facilities', path: '/uploads' },
  { name: 'reconciliation', route: 'reconciliation', as: 'facilities', path: '/reconciliation' },
  { name: 'account', route: 'account', as: 'ward', path: '/account' },
  { name: 'admin-sites', route: 'admin/sites', as: 'admin', path: '/admin/sites' },
  { name: 'admin-users', route: 'admin/users', as: 'admin', path: '/admin/users' },
  { name: 'admin-cylinder-types', route: 'admin/cylinder-types', as: 'admin', path: '/admin/cylinder-types' },
  { name: 'admin-suppliers', route: 'admin/suppliers', as: 'admin', path: '/admin/suppliers' },
  { name: 'admin-audit', route: 'admin/audit', as: 'admin', path: '/admin/audit' },
  { name: 'admin-mail', route: 'admin/mail', as: 'admin', path: '/admin/mail' },
  {
    name: 'admin-mail-message',
    route: 'admin/mail/:messageId',
    as: 'admin',
    path: async (api) => {
      const list = items<{ id: number }>(await api('/api/mail'));
      return list.length ? `/admin/mail/${list[0].id}` : null;
    },
  },
  { name: 'admin-outbox', route: 'admin/outbox', as: 'admin', path: '/admin/outbox' },
  { name: 'not-found', route: '*', as: 'facilities', path: '/no-such-screen' },
];
