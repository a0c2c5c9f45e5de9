import { useState } from 'react';
import { Controller, useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { ROLES, ROLE_LABELS, type Role } from '@common/api/roles';
import { userCreateSchema, userUpdateSchema } from '@common/schemas/admin.schema';
import { ApiError } from '@/lib/api-client';
import { applyServerErrors } from '@/lib/form-errors';
import { toast } from '@/lib/toast';
import { Alert } from '@/components/ui/alert';
import { CheckboxGroup } from '@/components/ui/checkbox-group';
import { FormActions } from '@/components/ui/dialog';
import { Checkbox, Field, Input } from '@/components/ui/field';
import { useCreateUser, useUpdateUser, type UserRow } from '../api/users-api';

export interface SiteOption {
  id: number;
  name: string;
}

const ROLE_HINTS: Record<Role, string> = {
  facilities_manager: 'sources, forecasts, reorder rules',
  ward_lead: 'ward usage, cylinder check',
  purchasing_officer: 'approves orders, deliveries, spend',
  biomedical_engineer: 'pipeline and manifold capacity',
  administrator: 'users, sites, catalogue',
};
const roleOptions = ROLES.map((r) => ({
  value: r,
  label: (
    <span>
      {ROLE_LABELS[r]} <span className="text-xs text-fg-muted">({ROLE_HINTS[r]})</span>
    </span>
  ),
}));
const optionalText = (v: unknown) => (v === '' || v === null || v === undefined ? undefined : String(v));

export function UserCreateForm({ sites, onDone }: { sites: SiteOption[]; onDone: () => void }) {
  const create = useCreateUser();
  const [banner, setBanner] = useState<string | null>(null);
  const { register, handleSubmit, setError, control, formState } = useForm({
    resolver: zodResolver(userCreateSchema),
    defaultValues: { email: '', name: '', roles: [] as Role[], siteIds: [] as number[], password: '' },
  });
  const e = formState.errors;
  const onSubmit = handleSubmit((body) => {
    setBanner(null);
    create.mutate(body, {
      onSuccess: (u) => {
        toast.ok(`Added ${u.name}.`);
        onDone();
      },
      onError: (error) => {
        if (error instanceof ApiError && error.code === 'duplicate') {
          setError('email', { type: 'server', message: error.message });
          return;
        }
        setBanner(applyServerErrors(error, setError, ['email', 'name', 'roles', 'siteIds', 'password']));
      },
    });
  });
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      {banner && (
        <Alert tone="critical" title="Not saved" role="alert">
          {banner}
        </Alert>
      )}
      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="Name" error={e.name?.message}>
          {(c) => <Input {...c} {...register('name')} autoComplete="off" />}
        </Field>
        <Field label="E-mail" error={e.email?.message}>
          {(c) => <Input {...c} {...register('email')} type="email" autoComplete="off" autoCapitalize="none" spellCheck={false} />}
        </Field>
        <Field
          label="First password"
          hint="At least 10 characters. Tell the person safely; they can change it under Account."
          error={e.password?.message}
          className="sm:col-span-2"
        >
          {(c) => <Input {...c} {...register('password')} type="password" autoComplete="new-password" />}
        </Field>
      </div>
      <Controller
        control={control}
        name="roles"
        render={({ field }) => (
          <CheckboxGroup legend="Roles" options={roleOptions} value={(field.value ?? []) as Role[]} onChange={field.onChange} error={e.roles?.message} />
        )}
      />
      <Controller
        control={control}
        name="siteIds"
        render={({ field }) => (
          <CheckboxGroup
            legend="Sites"
            hint="The person sees only these sites."
            options={sites.map((s) => ({ value: s.id, label: s.name }))}
            value={(field.value ?? []) as number[]}
            onChange={field.onChange}
            error={e.siteIds?.message}
          />
        )}
      />
      <FormActions onCancel={onDone} busy={create.isPending} submitLabel="Add user" />
    </form>
  );
}

export function UserEditForm({ user, sites, onDone, isSelf }: { user: UserRow; sites: SiteOption[]; onDone: () => void; isSelf: boolean }) {
  const update = useUpdateUser();
  const [banner, setBanner] = useState<string | null>(null);
  const { register, handleSubmit, setError, control, formState } = useForm({
    resolver: zodResolver(userUpdateSchema),
    defaultValues: { name: user.name, roles: user.roles, siteIds: user.siteIds, active: user.active, password: undefined as string | undefined },
  });
  const e = formState.errors;
  const onSubmit = handleSubmit((body) => {
    setBanner(null);
    update.mutate(
      { id: user.id, body },
      {
        onSuccess: (u) => {
          toast.ok(`Saved ${u.name}.`);
          onDone();
        },
        onError: (error) => setBanner(applyServerErrors(error, setError, ['name', 'roles', 'siteIds', 'active', 'password'])),
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
        E-mail: <span className="font-bold break-all text-fg">{user.email}</span>
      </p>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="Name" error={e.name?.message}>
          {(c) => <Input {...c} {...register('name')} autoComplete="off" />}
        </Field>
        <Field label="New password" hint="Leave empty to keep the present one." error={e.password?.message}>
          {(c) => <Input {...c} {...register('password', { setValueAs: optionalText })} type="password" autoComplete="new-password" />}
        </Field>
      </div>
      <Controller
        control={control}
        name="roles"
        render={({ field }) => (
          <CheckboxGroup legend="Roles" options={roleOptions} value={(field.value ?? []) as Role[]} onChange={field.onChange} error={e.roles?.message} />
        )}
      />
      <Controller
        control={control}
        name="siteIds"
        render={({ field }) => (
          <CheckboxGroup
            legend="Sites"
            options={sites.map((s) => ({ value: s.id, label: s.name }))}
            value={(field.value ?? []) as number[]}
            onChange={field.onChange}
            error={e.siteIds?.message}
          />
        )}
      />
      <Checkbox label="Active (may sign in)" disabled={isSelf} {...register('active')} />
      {isSelf && <p className="text-xs text-fg-muted">You cannot deactivate your own account.</p>}
      <FormActions onCancel={onDone} busy={update.isPending} />
    </form>
  );
}
