import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { loginSchema } from '@common/schemas/auth.schema';
import { ApiError } from '@/lib/api-client';
import { applyServerErrors } from '@/lib/form-errors';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Field, Input } from '@/components/ui/field';
import { useSignIn, type Me } from '../api/auth-api';

const FIELDS = ['email', 'password'] as const;

function bannerFor(error: unknown, fallback: string | null): { title: string; text: string | null } | null {
  if (error instanceof ApiError) {
    if (error.code === 'invalid_credentials')
      return { title: 'E-mail or password is not right', text: 'Check both and try again. After several failed tries the account is locked for a while.' };
    if (error.status === 423) return { title: 'This account is locked for now', text: error.message };
    if (error.status === 429) return { title: 'Too many tries', text: error.message };
  }
  return fallback ? { title: 'Could not sign in', text: fallback } : null;
}

export function SignInForm({ onSignedIn }: { onSignedIn: (me: Me) => void }) {
  const signIn = useSignIn();
  const [banner, setBanner] = useState<{ title: string; text: string | null } | null>(null);
  const { register, handleSubmit, setError, formState } = useForm({ resolver: zodResolver(loginSchema), defaultValues: { email: '', password: '' } });

  const onSubmit = handleSubmit((values) => {
    setBanner(null);
    signIn.mutate(values, {
      onSuccess: ({ csrfToken: _token, ...me }) => onSignedIn(me),
      onError: (error) => setBanner(bannerFor(error, applyServerErrors(error, setError, FIELDS))),
    });
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      {banner && (
        <Alert tone="critical" title={banner.title} role="alert">
          {banner.text}
        </Alert>
      )}
      <Field label="E-mail" error={formState.errors.email?.message}>
        {(c) => <Input {...c} {...register('email')} type="email" autoComplete="username" inputMode="email" autoCapitalize="none" spellCheck={false} />}
      </Field>
      <Field label="Password" error={formState.errors.password?.message}>
        {(c) => <Input {...c} {...register('password')} type="password" autoComplete="current-password" />}
      </Field>
      <Button type="submit" size="lg" busy={signIn.isPending} className="w-full">
        Sign in
      </Button>
    </form>
  );
}
