import { ROLES, type Role } from '@common/api/roles';
import type { IconName } from '@/components/ui/icons';

/**
 * Every screen the navigation can show, with the roles that may use it. A new screen is one line here
 * (plus its route in router.tsx); screens that do not exist yet are simply not listed, so there are no
 * dead links. Route loaders check the same roles (requireScreen), so the menu and the guard agree.
 */
export interface NavItem {
  path: string;
  label: string;
  icon: IconName;
  roles: readonly Role[];
  section: NavSection;
  /** Mark as current only on an exact match (the overview at `/`). */
  end?: boolean;
}

export type NavSection = 'work' | 'catalogue' | 'admin';

export const NAV_SECTIONS: Record<NavSection, string> = {
  work: 'Supply',
  catalogue: 'Catalogue',
  admin: 'Admin',
};

const EVERYONE = ROLES;

export const NAV_ITEMS: readonly NavItem[] = [
  { path: '/', label: 'Today', icon: 'today', roles: EVERYONE, section: 'work', end: true },
  { path: '/cylinder-check', label: 'Cylinder check', icon: 'cylinder', roles: EVERYONE, section: 'work' },
  { path: '/report', label: 'Report', icon: 'clipboard', roles: ['ward_lead', 'facilities_manager'], section: 'work' },
  { path: '/sources', label: 'Sources', icon: 'tank', roles: ['facilities_manager', 'biomedical_engineer', 'administrator'], section: 'work' },
  { path: '/wards', label: 'Wards', icon: 'bed', roles: ['facilities_manager', 'ward_lead'], section: 'work' },
  { path: '/uploads', label: 'Uploads', icon: 'upload', roles: ['facilities_manager'], section: 'work' },
  { path: '/reconciliation', label: 'Measured use', icon: 'chart', roles: ['facilities_manager', 'biomedical_engineer'], section: 'work' },
  { path: '/capacity', label: 'Capacity', icon: 'sites', roles: ['biomedical_engineer', 'facilities_manager', 'administrator'], section: 'work' },
  { path: '/orders', label: 'Orders', icon: 'supplier', roles: ['purchasing_officer', 'facilities_manager', 'administrator'], section: 'work' },
  {
    path: '/admin/cylinder-types',
    label: 'Cylinder types',
    icon: 'catalogue',
    roles: ['administrator', 'facilities_manager', 'biomedical_engineer', 'purchasing_officer'],
    section: 'catalogue',
  },
  {
    path: '/admin/suppliers',
    label: 'Suppliers',
    icon: 'supplier',
    roles: ['administrator', 'purchasing_officer', 'facilities_manager'],
    section: 'catalogue',
  },
  { path: '/admin/sites', label: 'Sites', icon: 'sites', roles: ['administrator'], section: 'admin' },
  { path: '/admin/users', label: 'Users', icon: 'users', roles: ['administrator'], section: 'admin' },
  { path: '/admin/audit', label: 'Audit log', icon: 'audit', roles: ['administrator'], section: 'admin' },
  { path: '/admin/mail', label: 'Mail', icon: 'mail', roles: ['administrator'], section: 'admin' },
  { path: '/admin/outbox', label: 'Outbox', icon: 'clock', roles: ['administrator'], section: 'admin' },
];

/** Screens reachable by everyone who is signed in, outside the main menu. */
export const ACCOUNT_PATH = '/account';

export function canUse(roles: readonly Role[], item: Pick<NavItem, 'roles'>): boolean {
  return item.roles.some((r) => roles.includes(r));
}

/** The menu for a person: their sections, in order, each with the screens their roles can use. */
export function navigationFor(roles: readonly Role[]): { section: NavSection; label: string; items: NavItem[] }[] {
  return (Object.keys(NAV_SECTIONS) as NavSection[])
    .map((section) => ({ section, label: NAV_SECTIONS[section], items: NAV_ITEMS.filter((i) => i.section === section && canUse(roles, i)) }))
    .filter((g) => g.items.length > 0);
}

export function navItem(path: string): NavItem {
  const item = NAV_ITEMS.find((i) => i.path === path);
  if (!item) throw new Error(`No navigation entry for ${path}`);
  return item;
}
