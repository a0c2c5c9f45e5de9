import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { changePasswordSchema } from '@common/schemas/auth.schema';
import { applyServerErrors } from '@/lib/form-errors';
import { toast } from '@/lib/toast';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Field, Input } from '@/components/ui/field';
import { useChangePassword } from '../api/auth-api';

// the shared rule plus a typed-twice check that only the browser needs
const formSchema = changePasswordSchema
  .and(z.object({ confirmPassword: z.string() }))
  .refine((v) => v.confirmPassword === v.newPassword, { path: ['confirmPassword'], message: 'the two new passwords are not the same' });

const FIELDS = ['currentPassword', 'newPassword', 'confirmPassword'] as const;

export function ChangePasswordForm() {
  const change = useChangePassword();
  const [banner, setBanner] = useState<string | null>(null);
  const { register, handleSubmit, setError, reset, formState } = useForm({
    resolver: zodResolver(formSchema),
    defaultValues: { currentPassword: '', newPassword: '', confirmPassword: '' },
  });
  const onSubmit = handleSubmit(({ currentPassword, newPassword }) => {
    setBanner(null);
    change.mutate(
      { currentPassword, newPassword },
      {
        onSuccess: () => {
          reset();
          toast.ok('Password changed.');
        },
        onError: (error) => setBanner(applyServerErrors(error, setError, FIELDS)),
      },
    );
  });
  return (
    <form onSubmit={onSubmit} noValidate className="flex max-w-md flex-col gap-4">
      {banner && (
        <Alert tone="critical" title="The password was not changed" role="alert">
          {banner}
        </Alert>
      )}
      <Field label="Current password" error={formState.errors.currentPassword?.message}>
        {(c) => <Input {...c} {...register('currentPassword')} type="password" autoComplete="current-password" />}
      </Field>
      <Field
        label="New password"
        hint="At least 10 characters. A few unrelated words make a long password that is easy to remember."
        error={formState.errors.newPassword?.message}
      >
        {(c) => <Input {...c} {...register('newPassword')} type="password" autoComplete="new-password" />}
      </Field>
      <Field label="New password again" error={formState.errors.confirmPassword?.message}>
        {(c) => <Input {...c} {...register('confirmPassword')} type="password" autoComplete="new-password" />}
      </Field>
      <div>
        <Button type="submit" busy={change.isPending}>
          Change password
        </Button>
      </div>
    </form>
  );
}
