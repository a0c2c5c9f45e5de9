import { keepPreviousData, queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type { Page } from '@common/schemas/common.schema';
import type { UserCreateInput, UserUpdateInput } from '@common/schemas/admin.schema';
import type { UserWardsInput } from '@common/schemas/admin.schema';
import type { UserRow } from '@common/schemas/admin.schema';
import { api } from '@/lib/api-client';
import type { ListParams } from '@/lib/list-params';

export type { UserRow };

export const usersQueries = {
  all: () => ['users'] as const,
  lists: () => [...usersQueries.all(), 'list'] as const,
  /** A page of users; the previous page stays on screen while the next loads. */
  list: (params: ListParams) =>
    queryOptions({
      queryKey: [...usersQueries.lists(), params] as const,
      queryFn: ({ signal }) => api.get<Page<UserRow>>('/users', { signal, query: { ...params } }),
      staleTime: 30_000,
      placeholderData: keepPreviousData,
    }),
};

function useInvalidateUsers() {
  const qc = useQueryClient();
  return () => qc.invalidateQueries({ queryKey: usersQueries.all() });
}

export function useCreateUser() {
  const invalidate = useInvalidateUsers();
  return useMutation({ mutationFn: (body: UserCreateInput) => api.post<UserRow>('/users', body), meta: { formHandlesErrors: true }, onSuccess: invalidate });
}

export function useUpdateUser() {
  const invalidate = useInvalidateUsers();
  return useMutation({
    mutationFn: ({ id, body }: { id: number; body: UserUpdateInput }) => api.patch<UserRow>(`/users/${id}`, body),
    meta: { formHandlesErrors: true },
    onSuccess: invalidate,
  });
}

export function useUnlockUser() {
  const invalidate = useInvalidateUsers();
  return useMutation({ mutationFn: (id: number) => api.post<UserRow>(`/users/${id}/unlock`), onSuccess: invalidate });
}

/** The wards granted to a ward lead, with every ward of the organisation by site to choose from. */
export interface UserWards {
  userId: number;
  wardIds: number[];
  sites: { id: number; name: string; granted: boolean; wards: { id: number; name: string; department: string; active: boolean }[] }[];
}

export const userWardsQueries = {
  all: () => [...usersQueries.all(), 'wards'] as const,
  detail: (userId: number) =>
    queryOptions({
      queryKey: [...userWardsQueries.all(), userId] as const,
      queryFn: ({ signal }) => api.get<UserWards>(`/users/${userId}/wards`, { signal }),
      staleTime: 10_000,
    }),
};

export function useSetUserWards() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, body }: { id: number; body: UserWardsInput }) => api.put<UserWards>(`/users/${id}/wards`, body),
    meta: { formHandlesErrors: true },
    onSuccess: (data) => {
      qc.setQueryData(userWardsQueries.detail(data.userId).queryKey, data);
      return qc.invalidateQueries({ queryKey: userWardsQueries.all() });
    },
  });
}
