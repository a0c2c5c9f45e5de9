import { useSuspenseQuery } from '@tanstack/react-query';
import { authQueries, type Me, type MeSite } from '@/features/auth/api/auth-api';
import { pickSite, useSelectedSiteId } from '@/lib/current-site';

/** The signed-in person (the app layout's loader has put it in the cache). */
export function useMe(): Me {
  return useSuspenseQuery(authQueries.me()).data;
}

/** The site being looked at, and the way to choose another. */
export function useCurrentSite(): { site: MeSite | null; sites: MeSite[]; setSiteId: (id: number) => void } {
  const me = useMe();
  const [id, setSiteId] = useSelectedSiteId();
  return { site: pickSite(me.sites, id), sites: me.sites, setSiteId };
}
