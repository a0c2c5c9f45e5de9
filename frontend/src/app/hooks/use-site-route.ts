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
  const urlSiteId = urlSite?.id;
  const currentId = site?.id;
  // Only a new address moves the picker, and only a new pick moves the address: each effect remembers
  // the value it last acted on, so a change made by the other one does not bounce back.
  const lastAddress = useRef<number | undefined>(undefined);
  useEffect(() => {
    if (urlSiteId === undefined || lastAddress.current === urlSiteId) return;
    lastAddress.current = urlSiteId;
    if (currentId !== urlSiteId) setSiteId(urlSiteId);
  }, [urlSiteId, currentId, setSiteId]);
  const lastPick = useRef(currentId);
  useEffect(() => {
    if (currentId === undefined || lastPick.current === currentId) return;
    lastPick.current = currentId;
    if (currentId !== siteId) navigate(pathFor(currentId));
  }, [currentId, siteId, navigate, pathFor]);
  return urlSite;
}
