import { useCallback } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { overviewQueries } from '@/features/overview/api/overview-api';
import { sourcesQueries } from '@/features/sources/api/sources-api';
import { wardsQueries } from '@/features/wards/api/wards-api';

/**
 * A reading, a delivery, a therapy line or a setting moves the forecasts every supply screen shows:
 * after any such write the overview, the sources and the wards are refetched when next looked at.
 * Features do not know each other's query keys; the app does.
 */
export function useRefreshSupply(): () => void {
  const qc = useQueryClient();
  return useCallback(() => {
    for (const queryKey of [overviewQueries.all(), sourcesQueries.all(), wardsQueries.all()]) void qc.invalidateQueries({ queryKey });
  }, [qc]);
}
