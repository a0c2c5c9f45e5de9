import { useCallback, useSyncExternalStore } from 'react';

/**
 * The site the person is looking at, kept in the browser (a view preference, not server data).
 * Screens receive the chosen site from app/ and fall back to the first granted site.
 */
const KEY = 'plenum.siteId';
const listeners = new Set<() => void>();

function read(): number | null {
  try {
    const v = Number(localStorage.getItem(KEY));
    return Number.isInteger(v) && v > 0 ? v : null;
  } catch {
    return null;
  }
}

export function useSelectedSiteId(): [number | null, (id: number) => void] {
  const id = useSyncExternalStore(
    (l) => {
      listeners.add(l);
      return () => listeners.delete(l);
    },
    read,
    () => null,
  );
  const set = useCallback((next: number) => {
    try {
      localStorage.setItem(KEY, String(next));
    } catch {
      // private mode: the choice lasts for this page only
    }
    for (const l of listeners) l();
  }, []);
  return [id, set];
}

/** The chosen site if it is still granted, else the first one. */
export function pickSite<S extends { id: number }>(sites: S[], id: number | null): S | null {
  return sites.find((s) => s.id === id) ?? sites[0] ?? null;
}
