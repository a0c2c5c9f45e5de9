import { USER_SORT_KEYS } from '@common/schemas/common.schema';
import { useMemo, useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { createColumnHelper } from '@tanstack/react-table';
import { ROLE_LABELS } from '@common/api/roles';
import { formatDateTime } from '@/lib/format';
import { useListParams } from '@/lib/list-params';
import { toast } from '@/lib/toast';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { DataTable } from '@/components/ui/data-table';
import { Dialog } from '@/components/ui/dialog';
import { Icon } from '@/components/ui/icons';
import { Pagination } from '@/components/ui/pagination';
import { SearchInput } from '@/components/ui/search-input';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { usersQueries, useUnlockUser, type UserRow } from '../api/users-api';
import { UserCreateForm, UserEditForm, type SiteOption } from './user-forms';
import { UserWardsDialogBody } from './ward-grants';

const col = createColumnHelper<UserRow>();
export const USERS_LIST_DEFAULTS = { pageSize: 25, sort: 'name', dir: 'asc' as const, sortKeys: USER_SORT_KEYS };

export function UsersAdmin({ sites, currentUserId }: { sites: SiteOption[]; currentUserId: number }) {
  const { params, sorting, setSorting, setPage, setQuery } = useListParams(USERS_LIST_DEFAULTS);
  const users = useQuery(usersQueries.list(params));
  const unlock = useUnlockUser();
  const [editing, setEditing] = useState<UserRow | 'new' | null>(null);
  const [wardsOf, setWardsOf] = useState<UserRow | null>(null);
  const siteName = useMemo(() => new Map(sites.map((s) => [s.id, s.name])), [sites]);

  const columns = useMemo(
    () => [
      col.accessor('name', {
        header: 'Name',
        cell: (info) => (
          <span>
            <span className="font-bold">{info.getValue()}</span>
            <span className="block text-xs wrap-anywhere text-fg-muted xl:hidden">{info.row.original.email}</span>
          </span>
        ),
      }),
      col.accessor('email', {
        header: 'E-mail',
        cell: (info) => <span className="wrap-anywhere">{info.getValue()}</span>,
        meta: { className: 'hidden xl:table-cell' },
      }),
      col.accessor('roles', {
        header: 'Roles',
        enableSorting: false,
        cell: (info) =>
          info
            .getValue()
            .map((r) => ROLE_LABELS[r])
            .join(', '),
      }),
      col.accessor('siteIds', {
        header: 'Sites',
        enableSorting: false,
        meta: { className: 'hidden md:table-cell' },
        cell: (info) =>
          info
            .getValue()
            .map((id) => siteName.get(id) ?? `#${id}`)
            .join(', ') || '–',
      }),
      col.display({
        id: 'status',
        header: 'Status',
        cell: (info) => {
          const u = info.row.original;
          if (!u.active) return <Badge>Inactive</Badge>;
          if (u.locked)
            return (
              <Badge tone="critical" icon="lock">
                Locked
              </Badge>
            );
          return <Badge tone="ok">Active</Badge>;
        },
      }),
      col.accessor('createdAt', {
        header: 'Added',
        meta: { className: 'hidden lg:table-cell' },
        cell: (info) => <span className="whitespace-nowrap">{formatDateTime(info.getValue())}</span>,
      }),
      col.display({
        id: 'actions',
        header: () => <span className="sr-only">Actions</span>,
        cell: (info) => {
          const u = info.row.original;
          return (
            <div className="flex justify-end gap-1">
              {u.locked && (
                <Button
                  variant="secondary"
                  size="sm"
                  busy={unlock.isPending && unlock.variables === u.id}
                  onClick={() => unlock.mutate(u.id, { onSuccess: () => toast.ok(`${u.name} can sign in again.`) })}
                >
                  Unlock
                </Button>
              )}
              {u.roles.includes('ward_lead') && (
                <Button variant="ghost" size="sm" onClick={() => setWardsOf(u)} aria-label={`Wards of ${u.name}`}>
                  <Icon name="bed" className="size-4" />
                  Wards
                </Button>
              )}
              <Button variant="ghost" size="sm" onClick={() => setEditing(u)} aria-label={`Edit ${u.name}`}>
                <Icon name="pencil" className="size-4" />
                Edit
              </Button>
            </div>
          );
        },
      }),
    ],
    [siteName, unlock],
  );

  return (
    <Card>
      <div className="flex flex-wrap items-center justify-between gap-3 border-b border-line px-4 py-3">
        <SearchInput value={params.q ?? ''} onChange={setQuery} label="Search by name or e-mail" />
        <Button onClick={() => setEditing('new')}>
          <Icon name="plus" />
          New user
        </Button>
      </div>
      {users.isPending ? (
        <LoadingState label="Loading users…" />
      ) : users.isError ? (
        <ErrorState error={users.error} onRetry={() => users.refetch()} />
      ) : (
        <>
          <DataTable
            caption="Users"
            columns={columns}
            data={users.data.items}
            getRowId={(u) => String(u.id)}
            sorting={sorting}
            onSortingChange={setSorting}
            empty={<EmptyState title={params.q ? `No user matches “${params.q}”` : 'No users yet'} icon="users" />}
          />
          <Pagination page={users.data.page} pageSize={users.data.pageSize} total={users.data.total} onPage={setPage} busy={users.isPlaceholderData} />
        </>
      )}
      <Dialog open={editing !== null} onClose={() => setEditing(null)} title={editing === 'new' ? 'New user' : `Edit ${editing?.name ?? ''}`} wide>
        {editing === 'new' && <UserCreateForm sites={sites} onDone={() => setEditing(null)} />}
        {editing !== null && editing !== 'new' && (
          <UserEditForm user={editing} sites={sites} isSelf={editing.id === currentUserId} onDone={() => setEditing(null)} />
        )}
      </Dialog>
      <Dialog open={wardsOf !== null} onClose={() => setWardsOf(null)} title={`Wards of ${wardsOf?.name ?? ''}`} wide>
        {wardsOf !== null && <UserWardsDialogBody user={wardsOf} onDone={() => setWardsOf(null)} />}
      </Dialog>
    </Card>
  );
}
