import { useEffect, useState } from 'react';
import { NavLink, Outlet, useLocation, useNavigate, useNavigation } from 'react-router-dom';
import { ROLE_LABELS } from '@common/api/roles';
import { cn } from '@/lib/cn';
import { useSignOut } from '@/features/auth/api/auth-api';
import { Icon } from '@/components/ui/icons';
import { PlenumWordmark } from '@/components/ui/logo';
import { Select } from '@/components/ui/field';
import { Spinner } from '@/components/ui/spinner';
import { ACCOUNT_PATH, navigationFor } from '../navigation';
import { useCurrentSite, useMe } from '../hooks/use-current-site';

/**
 * The frame of every signed-in screen: a side navigation on wide screens; on phones a top bar with a
 * "Menu" button that opens the same navigation full screen (large targets, one thumb).
 */
export function AppShell() {
  const me = useMe();
  const location = useLocation();
  const navigation = useNavigation();
  const [menuOpen, setMenuOpen] = useState(false);

  useEffect(() => setMenuOpen(false), [location.pathname]);
  useEffect(() => {
    if (!menuOpen) return;
    const onKey = (e: KeyboardEvent) => e.key === 'Escape' && setMenuOpen(false);
    window.addEventListener('keydown', onKey);
    // the page behind the open menu stays put
    const overflow = document.body.style.overflow;
    document.body.style.overflow = 'hidden';
    return () => {
      window.removeEventListener('keydown', onKey);
      document.body.style.overflow = overflow;
    };
  }, [menuOpen]);

  return (
    <div className="min-h-dvh lg:grid lg:grid-cols-[17rem_1fr]">
      <a href="#main" className="sr-only z-50 rounded bg-surface px-4 py-3 font-bold focus:not-sr-only focus:fixed focus:top-2 focus:left-2">
        Skip to content
      </a>
      {navigation.state === 'loading' && (
        <div className="fixed inset-x-0 top-0 z-50 h-1 animate-pulse bg-focus" role="progressbar" aria-label="Loading the next screen" />
      )}

      {/* phones and tablets: top bar */}
      <header className="sticky top-0 z-40 flex h-16 items-center justify-between gap-2 border-b border-ink-900 bg-primary px-3 text-primary-fg lg:hidden">
        <NavLink to="/" className="rounded-lg" aria-label="Plenum, Today">
          <PlenumWordmark inverted />
        </NavLink>
        <button
          type="button"
          aria-expanded={menuOpen}
          aria-controls="mobile-menu"
          onClick={() => setMenuOpen((o) => !o)}
          className="inline-flex min-h-12 items-center gap-2 rounded-lg border border-ink-600 px-4 font-bold hover:bg-ink-700"
        >
          <Icon name={menuOpen ? 'close' : 'menu'} />
          Menu
        </button>
      </header>
      {menuOpen && (
        <div id="mobile-menu" className="fixed inset-x-0 top-16 bottom-0 z-40 overflow-y-auto bg-ink-900 text-primary-fg lg:hidden">
          <NavContent onNavigate={() => setMenuOpen(false)} />
        </div>
      )}

      {/* wide screens: side navigation */}
      <div className="hidden bg-ink-900 lg:block">
        <aside className="sticky top-0 flex h-dvh flex-col overflow-y-auto text-primary-fg">
          <div className="px-5 pt-5 pb-3">
            <NavLink to="/" className="rounded-lg" aria-label="Plenum, Today">
              <PlenumWordmark inverted />
            </NavLink>
            <p className="mt-2 truncate text-xs text-ink-200" title={me.organisation.name}>
              {me.organisation.name}
            </p>
          </div>
          <NavContent />
        </aside>
      </div>

      <main id="main" className="min-w-0 px-4 py-5 sm:px-6 lg:px-10 lg:py-8">
        <Outlet />
      </main>
    </div>
  );
}

function NavContent({ onNavigate }: { onNavigate?: () => void }) {
  const me = useMe();
  const navigate = useNavigate();
  const signOut = useSignOut();
  const groups = navigationFor(me.user.roles);

  return (
    <div className="flex min-h-full flex-1 flex-col">
      <SitePicker />
      <nav aria-label="Main" className="flex-1 px-3 py-2">
        {groups.map((g) => (
          <div key={g.section} className="mb-4">
            <p className="px-3 pb-1 text-xs font-bold tracking-wider text-ink-200 uppercase">{g.label}</p>
            <ul className="flex flex-col gap-0.5">
              {g.items.map((item) => (
                <li key={item.path}>
                  <NavLink to={item.path} end={item.end} onClick={onNavigate} className={navLinkClass}>
                    <Icon name={item.icon} />
                    {item.label}
                  </NavLink>
                </li>
              ))}
            </ul>
          </div>
        ))}
      </nav>
      <div className="border-t border-ink-700 px-3 py-3">
        <p className="px-3 font-bold">{me.user.name}</p>
        <p className="px-3 pb-2 text-xs text-ink-200">{me.user.roles.map((r) => ROLE_LABELS[r]).join(' · ')}</p>
        <NavLink to={ACCOUNT_PATH} onClick={onNavigate} className={navLinkClass}>
          <Icon name="account" />
          Account
        </NavLink>
        <button
          type="button"
          disabled={signOut.isPending}
          onClick={() =>
            signOut.mutate(undefined, {
              onSettled: () => void Promise.resolve(navigate('/sign-in', { replace: true })).then(signOut.forget),
            })
          }
          className="flex min-h-12 w-full items-center gap-3 rounded-lg px-3 font-bold text-ink-50 hover:bg-ink-700"
        >
          {signOut.isPending ? <Spinner /> : <Icon name="signOut" />}
          Sign out
        </button>
      </div>
    </div>
  );
}

function navLinkClass({ isActive }: { isActive: boolean }) {
  return cn('flex min-h-12 items-center gap-3 rounded-lg px-3 font-bold text-ink-50 hover:bg-ink-700', isActive && 'bg-ink-50 text-ink-900 hover:bg-ink-100');
}

function SitePicker() {
  const { site, sites, setSiteId } = useCurrentSite();
  if (sites.length === 0) return <p className="px-6 py-2 text-sm text-ink-200">No site granted yet: ask an administrator.</p>;
  if (sites.length === 1) {
    return (
      <div className="px-6 py-2">
        <p className="text-xs font-bold tracking-wider text-ink-200 uppercase">Site</p>
        <p className="font-bold">{site?.name}</p>
      </div>
    );
  }
  return (
    <div className="px-6 py-2">
      <label className="flex flex-col gap-1">
        <span className="text-xs font-bold tracking-wider text-ink-200 uppercase">Site</span>
        <Select value={site?.id ?? ''} onChange={(e) => setSiteId(Number(e.target.value))} className="border-ink-600 bg-ink-800 font-bold text-white">
          {sites.map((s) => (
            <option key={s.id} value={s.id}>
              {s.name}
            </option>
          ))}
        </Select>
      </label>
    </div>
  );
}
