import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { useForm, useWatch } from 'react-hook-form';
import type { z } from 'zod';
import { deviceFlowsSchema } from '@common/schemas/supply.schema';
import { bodyResolver } from '@/lib/body-resolver';
import { applyServerErrors } from '@/lib/form-errors';
import { formatNumber } from '@/lib/format';
import { toast } from '@/lib/toast';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { FieldError, humaniseMessage, UnitInput } from '@/components/ui/field';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { useSaveDeviceFlows, wardsQueries, type DeviceFlow } from '../api/wards-api';

/**
 * The flow per patient each oxygen device is planned at, for the whole organisation. Beside each: the
 * documented default, its usual range and where that comes from. Only flows that differ from the
 * default are stored, so a later change of the documented default reaches every untouched device.
 */
export function DeviceFlowsPanel({ canEdit, onSaved }: { canEdit: boolean; onSaved?: () => void }) {
  const flows = useQuery(wardsQueries.deviceFlows());
  return (
    <Card>
      <CardHeader title="Device flows" description="Flow per patient used by every therapy line that leaves its flow blank. Organisation-wide." />
      {flows.isPending ? (
        <LoadingState label="Loading device flows…" />
      ) : flows.isError ? (
        <ErrorState error={flows.error} onRetry={() => flows.refetch()} />
      ) : (
        <DeviceFlowsForm key={flows.dataUpdatedAt} flows={flows.data} canEdit={canEdit} onSaved={onSaved} />
      )}
    </Card>
  );
}

function DeviceFlowsForm({ flows, canEdit, onSaved }: { flows: DeviceFlow[]; canEdit: boolean; onSaved?: () => void }) {
  const save = useSaveDeviceFlows(onSaved);
  const [banner, setBanner] = useState<string | null>(null);
  const { register, handleSubmit, setError, setValue, control, formState } = useForm({
    resolver: bodyResolver<z.input<typeof deviceFlowsSchema>, typeof deviceFlowsSchema>(deviceFlowsSchema, (v) => v),
    defaultValues: { flows: flows.map((f) => ({ device: f.device, flowLMin: f.flowLMin })) },
  });
  const values = useWatch({ control, name: 'flows' });
  const e = formState.errors;

  const onSubmit = handleSubmit((body) => {
    setBanner(null);
    const changed = body.flows.filter((f) => {
      const d = flows.find((x) => x.device === f.device);
      return d && Math.abs(d.defaultFlowLMin - f.flowLMin) > 1e-9;
    });
    save.mutate(changed, {
      onSuccess: () => toast.ok('Device flows saved. Forecasts now use them.'),
      onError: (error) => setBanner(applyServerErrors(error, setError, ['flows'])),
    });
  });

  return (
    <form onSubmit={onSubmit} noValidate>
      <CardBody className="flex flex-col gap-3">
        {banner && (
          <Alert tone="critical" title="Not saved" role="alert">
            {banner}
          </Alert>
        )}
        <ul className="divide-y divide-line">
          {flows.map((f, i) => {
            const current = Number(values?.[i]?.flowLMin);
            const differs = Number.isFinite(current) && Math.abs(current - f.defaultFlowLMin) > 1e-9;
            const outside = Number.isFinite(current) && (current < f.rangeLMin[0] || current > f.rangeLMin[1]);
            const err = e.flows?.[i]?.flowLMin?.message;
            return (
              <li key={f.device} className="grid gap-2 py-3 sm:grid-cols-[minmax(0,1fr)_11rem] sm:items-start sm:gap-4">
                <div className="min-w-0">
                  <p className="flex flex-wrap items-center gap-2 font-bold">
                    {canEdit ? <label htmlFor={`flow-${f.device}`}>{f.label}</label> : <span>{f.label}</span>}
                    {differs && <Badge tone="info">Own value</Badge>}
                  </p>
                  <p className="text-sm text-fg-muted">
                    Documented default {formatNumber(f.defaultFlowLMin, 1)} L/min (usual range {formatNumber(f.rangeLMin[0], 1)}–
                    {formatNumber(f.rangeLMin[1], 1)}). Source: {f.source}.
                  </p>
                  {outside && <p className="text-sm font-bold text-warn">Outside the usual range: check with the clinical lead.</p>}
                </div>
                <div className="flex flex-col gap-1">
                  {canEdit ? (
                    <>
                      <UnitInput
                        id={`flow-${f.device}`}
                        {...register(`flows.${i}.flowLMin`, { valueAsNumber: true })}
                        unit="L/min"
                        inputMode="decimal"
                        aria-invalid={err ? true : undefined}
                      />
                      {err && <FieldError>{humaniseMessage(err)}</FieldError>}
                      {differs && (
                        <Button variant="ghost" size="sm" onClick={() => setValue(`flows.${i}.flowLMin`, f.defaultFlowLMin, { shouldDirty: true })}>
                          Back to {formatNumber(f.defaultFlowLMin, 1)}
                        </Button>
                      )}
                    </>
                  ) : (
                    <p className="text-lg font-bold tabular sm:text-right">{formatNumber(f.flowLMin, 1)} L/min</p>
                  )}
                </div>
              </li>
            );
          })}
        </ul>
        {canEdit && (
          <div className="flex flex-wrap items-center gap-3 border-t border-line pt-3">
            <Button type="submit" busy={save.isPending} disabled={!formState.isDirty}>
              Save device flows
            </Button>
            <p className="text-sm text-fg-muted">Changes every ward’s modelled demand that uses these devices.</p>
          </div>
        )}
      </CardBody>
    </form>
  );
}
