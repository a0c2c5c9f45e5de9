import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type { ApprovalLimitInput } from '@common/schemas/orders.schema';
import type { ApprovalLimitRow } from '@common/schemas/orders.schema';
import { api } from '@/lib/api-client';
import { usersQueries } from './users-api';

export type { ApprovalLimitRow };

export const approvalLimitQueries = {
  all: () => [...usersQueries.all(), 'approval-limits'] as const,
  /** Changes only when an administrator edits a limit or a role: fresh for a minute. */
  list: () =>
    queryOptions({
      queryKey: approvalLimitQueries.all(),
      queryFn: ({ signal }) => api.get<ApprovalLimitRow[]>('/approval-limits', { signal }),
      staleTime: 60_000,
    }),
};

export function useSetApprovalLimit() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ userId, body }: { userId: number; body: ApprovalLimitInput }) => api.put<ApprovalLimitRow>(`/users/${userId}/approval-limit`, body),
    meta: { formHandlesErrors: true },
    onSuccess: () => qc.invalidateQueries({ queryKey: approvalLimitQueries.all() }),
  });
}
