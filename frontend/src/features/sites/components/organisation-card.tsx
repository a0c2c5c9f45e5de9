import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { organisationSchema } from '@common/schemas/admin.schema';
import { applyServerErrors } from '@/lib/form-errors';
import { toast } from '@/lib/toast';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Field, Input } from '@/components/ui/field';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { sitesQueries, useRenameOrganisation, type Organisation } from '../api/sites-api';

export function OrganisationCard({ onRenamed }: { onRenamed?: () => void }) {
  const org = useQuery(sitesQueries.organisation());
  return (
    <Card>
      <CardHeader title="Organisation" description="The name shown to everyone in your organisation." />
      <CardBody>
        {org.isPending ? (
          <LoadingState />
        ) : org.isError ? (
          <ErrorState error={org.error} onRetry={() => org.refetch()} />
        ) : (
          <RenameForm key={org.data.name} org={org.data} onRenamed={onRenamed} />
        )}
      </CardBody>
    </Card>
  );
}

function RenameForm({ org, onRenamed }: { org: Organisation; onRenamed?: () => void }) {
  const rename = useRenameOrganisation(onRenamed);
  const [banner, setBanner] = useState<string | null>(null);
  const { register, handleSubmit, setError, formState } = useForm({ resolver: zodResolver(organisationSchema), defaultValues: { name: org.name } });
  const onSubmit = handleSubmit(({ name }) => {
    setBanner(null);
    rename.mutate(name, { onSuccess: () => toast.ok('Organisation renamed.'), onError: (error) => setBanner(applyServerErrors(error, setError, ['name'])) });
  });
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3 sm:flex-row sm:items-end">
      {banner && (
        <Alert tone="critical" role="alert">
          {banner}
        </Alert>
      )}
      <Field label="Name" error={formState.errors.name?.message} className="flex-1">
        {(c) => <Input {...c} {...register('name')} />}
      </Field>
      <Button type="submit" variant="secondary" busy={rename.isPending} disabled={!formState.isDirty}>
        Rename
      </Button>
    </form>
  );
}
