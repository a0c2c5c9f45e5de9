import { NavLink } from 'react-router-dom';
import { cn } from '@/lib/cn';

const TABS = [
  { to: '/orders', label: 'Requests', end: true },
  { to: '/orders/purchase-orders', label: 'Purchase orders', end: false },
  { to: '/orders/spend', label: 'Spend & rental', end: false },
];

/** The three views of ordering, as links (each is its own route and address). */
export function OrdersTabs() {
  return (
    <nav aria-label="Orders" className="flex flex-wrap gap-1 border-b border-line">
      {TABS.map((t) => (
        <NavLink
          key={t.to}
          to={t.to}
          end={t.end}
          className={({ isActive }) =>
            cn(
              '-mb-px inline-flex min-h-11 items-center border-b-2 px-4 font-bold',
              isActive ? 'border-primary text-primary' : 'border-transparent text-fg-muted hover:text-primary',
            )
          }
        >
          {t.label}
        </NavLink>
      ))}
    </nav>
  );
}
