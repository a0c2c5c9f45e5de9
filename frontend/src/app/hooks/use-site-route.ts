import { useEffect, useRef } from 'react';
import { useNavigate } from 'react-router-dom';
import type { MeSite } from '@/features/auth/api/auth-api';
import { useCurrentSite } from './use-current-site';

/**
 * Screens addressed by site (/sites/3/wards) and the site picker in the menu agree: opening the address
 * makes its site the current one, and choosing another site in the picker moves the screen to it.
 * Returns the site the address names, or null when it is not one of the person's sites.
 */
export function useSiteRoute(siteId: number, pathFor: (id: number) => string): MeSite | null {
  const { site, sites, setSiteId } = useCurrentSite();
  const navigate = useNavigate();
  const urlSite = sites.find((s) => s.id === siteId) ?? null;
  useEffect(() => {
    if (urlSite && site?.id !== urlSite.id) setSiteId(urlSite.id);
    // only a new address should move the picker
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [urlSite?.id]);
  const previous = useRef(site?.id);
  useEffect(() => {
    if (!site || previous.current === site.id) return;
    previous.current = site.id;
    if (site.id !== siteId) navigate(pathFor(site.id));
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [site?.id]);
  return urlSite;
}
