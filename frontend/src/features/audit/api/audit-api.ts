import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import type { Page } from '@common/schemas/common.schema';
import type { AuditRow } from '@common/schemas/audit.schema';
import { api } from '@/lib/api-client';
import type { ListParams } from '@/lib/list-params';

export type { AuditRow };

export const auditQueries = {
  all: () => ['audit'] as const,
  /** The log only grows; 15 s keeps a freshly made change visible when the admin comes to look. */
  list: (params: ListParams) =>
    queryOptions({
      queryKey: [...auditQueries.all(), 'list', params] as const,
      queryFn: ({ signal }) => api.get<Page<AuditRow>>('/audit', { signal, query: { ...params } }),
      staleTime: 15_000,
      placeholderData: keepPreviousData,
    }),
};
