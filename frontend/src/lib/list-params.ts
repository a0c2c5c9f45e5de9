import { useCallback, useMemo } from 'react';
import { useSearchParams } from 'react-router-dom';
import type { SortingState } from '@tanstack/react-table';

/**
 * Paging, sorting and filtering of a server-paged list, kept in the address so a reload, the back
 * button and a shared link show the same rows; loaders read the same values to fetch early.
 */
export interface ListParams {
  page: number;
  pageSize: number;
  sort?: string;
  dir: 'asc' | 'desc';
  q?: string;
  [extra: string]: string | number | undefined;
}

/** A page number from the address: a whole number from 1 up; anything else (text, 0, -3, 1e400) is page 1. */
export function pageFromSearch(raw: string | null): number {
  const n = Math.floor(Number(raw));
  return Number.isSafeInteger(n) && n >= 1 ? n : 1;
}

/** `sortKeys`: the keys the list's server sorts by (shared schema); another `sort` in the address is dropped. */
export function parseListParams(
  search: URLSearchParams,
  defaults: { pageSize?: number; sort?: string; dir?: 'asc' | 'desc'; sortKeys?: readonly string[] } = {},
  extras: readonly string[] = [],
): ListParams {
  const page = pageFromSearch(search.get('page'));
  const pageSize = Math.min(200, Math.max(5, Math.floor(Number(search.get('pageSize')) || defaults.pageSize || 25)));
  const dirRaw = search.get('dir');
  const sortRaw = search.get('sort');
  const params: ListParams = {
    page,
    pageSize,
    sort: sortRaw && (!defaults.sortKeys || defaults.sortKeys.includes(sortRaw)) ? sortRaw : defaults.sort,
    dir: dirRaw === 'asc' || dirRaw === 'desc' ? dirRaw : (defaults.dir ?? 'asc'),
    q: search.get('q') || undefined,
  };
  for (const key of extras) params[key] = search.get(key) || undefined;
  return params;
}

export function useListParams(defaults: Parameters<typeof parseListParams>[1] = {}, extras: readonly string[] = []) {
  const [search, setSearch] = useSearchParams();
  // Callers pass literals (a new object each render): depend on their content, not their identity.
  const defaultsKey = JSON.stringify(defaults);
  const extrasKey = extras.join('\n');
  const params = useMemo(
    () => parseListParams(search, JSON.parse(defaultsKey) as typeof defaults, extrasKey ? extrasKey.split('\n') : []),
    [search, defaultsKey, extrasKey],
  );

  const update = useCallback(
    (patch: Record<string, string | number | undefined>, resetPage = true) => {
      setSearch(
        (prev) => {
          const next = new URLSearchParams(prev);
          for (const [k, v] of Object.entries(patch)) {
            if (v === undefined || v === '') next.delete(k);
            else next.set(k, String(v));
          }
          if (resetPage && !('page' in patch)) next.delete('page');
          return next;
        },
        { replace: true },
      );
    },
    [setSearch],
  );

  const sorting: SortingState = useMemo(() => (params.sort ? [{ id: params.sort, desc: params.dir === 'desc' }] : []), [params.sort, params.dir]);
  const setSorting = useCallback(
    (updater: SortingState | ((old: SortingState) => SortingState)) => {
      const next = typeof updater === 'function' ? updater(sorting) : updater;
      const first = next[0];
      update({ sort: first?.id, dir: first ? (first.desc ? 'desc' : 'asc') : undefined });
    },
    [sorting, update],
  );

  return { params, update, sorting, setSorting, setPage: (page: number) => update({ page }, false), setQuery: (q: string) => update({ q }) };
}
