import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Controller, useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { userWardsSchema } from '@common/schemas/admin.schema';
import { applyServerErrors } from '@/lib/form-errors';
import { toast } from '@/lib/toast';
import { Alert } from '@/components/ui/alert';
import { CheckboxGroup } from '@/components/ui/checkbox-group';
import { FormActions } from '@/components/ui/dialog';
import { FieldError, humaniseMessage } from '@/components/ui/field';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { userWardsQueries, useSetUserWards, type UserRow, type UserWards } from '../api/users-api';

/**
 * The wards a ward lead sees and reports for, one group of checkboxes per site. A ward lead with no
 * ward granted sees no ward at all, so the dialog says so.
 */
export function UserWardsDialogBody({ user, onDone }: { user: UserRow; onDone: () => void }) {
  const q = useQuery(userWardsQueries.detail(user.id));
  if (q.isPending) return <LoadingState label="Loading the wards…" />;
  if (q.isError) return <ErrorState error={q.error} onRetry={() => q.refetch()} />;
  // No key from the data: saving refreshes it, and a remount would drop the save's own onSuccess.
  return <UserWardsForm user={user} data={q.data} onDone={onDone} />;
}

function UserWardsForm({ user, data, onDone }: { user: UserRow; data: UserWards; onDone: () => void }) {
  const save = useSetUserWards();
  const [banner, setBanner] = useState<string | null>(null);
  const { handleSubmit, setError, control, formState, watch } = useForm({
    resolver: zodResolver(userWardsSchema),
    defaultValues: { wardIds: data.wardIds },
  });
  const chosen = watch('wardIds');
  const sites = data.sites.filter((s) => s.wards.length > 0);
  const onSubmit = handleSubmit((body) => {
    setBanner(null);
    save.mutate(
      { id: user.id, body },
      {
        onSuccess: (r) => {
          toast.ok(
            r.wardIds.length ? `${user.name} now reports for ${r.wardIds.length} ward${r.wardIds.length === 1 ? '' : 's'}.` : `${user.name} has no wards now.`,
          );
          onDone();
        },
        onError: (error) => setBanner(applyServerErrors(error, setError, ['wardIds'])),
      },
    );
  });
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      {banner && (
        <Alert tone="critical" title="Not saved" role="alert">
          {banner}
        </Alert>
      )}
      <p className="text-sm text-fg-muted">
        A ward lead sees, and files reports for, only the wards ticked here. Other roles of the same person still see every ward of their sites.
      </p>
      {!user.roles.includes('ward_lead') && (
        <Alert tone="warn" title="Not a ward lead">
          Wards are granted to ward leads. Give {user.name} the ward-lead role first; you can still take wards away here.
        </Alert>
      )}
      {chosen.length === 0 && (
        <Alert tone="info" title="No wards granted">
          {user.name} sees no ward until you tick at least one.
        </Alert>
      )}
      {sites.length === 0 ? (
        <EmptyState title="No wards yet">A facilities manager adds the wards of each site; then you can grant them here.</EmptyState>
      ) : (
        <Controller
          control={control}
          name="wardIds"
          render={({ field }) => (
            <div className="flex flex-col gap-4">
              {sites.map((site) => {
                const ids = new Set(site.wards.map((w) => w.id));
                return (
                  <CheckboxGroup
                    key={site.id}
                    legend={site.name}
                    hint={site.granted ? undefined : `${user.name} is not granted this site: these wards count once the site is granted (Edit).`}
                    options={site.wards.map((w) => ({ value: w.id, label: w.active ? w.name : `${w.name} (inactive)` }))}
                    value={(field.value ?? []).filter((id) => ids.has(id))}
                    onChange={(next) => field.onChange([...(field.value ?? []).filter((id) => !ids.has(id)), ...next])}
                  />
                );
              })}
            </div>
          )}
        />
      )}
      {formState.errors.wardIds?.message && <FieldError>{humaniseMessage(formState.errors.wardIds.message)}</FieldError>}
      <FormActions onCancel={onDone} busy={save.isPending} submitLabel="Save wards" />
    </form>
  );
}
