import { useState } from 'react';
import { Link } from 'react-router-dom';
import { useFieldArray, useForm, useWatch } from 'react-hook-form';
import { FEED_ROLES, wardFeedsSchema } from '@common/schemas/supply.schema';
import { bodyResolver } from '@/lib/body-resolver';
import { applyServerErrors } from '@/lib/form-errors';
import { toast } from '@/lib/toast';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Field, Select } from '@/components/ui/field';
import { Icon } from '@/components/ui/icons';
import { EmptyState } from '@/components/ui/states';
import { useSaveFeeds, type Feed, type SourceOption, type WardDetail } from '../api/wards-api';
import { FEED_ROLE_LABEL, gasName } from '../lib/ward-labels';

interface FeedsFormValues {
  feeds: { sourceId: number; role: Feed['role'] }[];
}

/** An empty number field: shown blank, and reported by the schema as "must be a number" if left so. */
const BLANK = '' as unknown as number;
const optionalId = (v: unknown) => (v === '' || v === null || v === undefined ? BLANK : Number(v));

/**
 * Which source supplies each gas to the ward: one primary per gas (its demand counts against that
 * source), and secondary or reserve sources that take over. The gas follows from the source.
 */
export function FeedsEditor({ detail, sources, canEdit, onSaved }: { detail: WardDetail; sources: SourceOption[]; canEdit: boolean; onSaved?: () => void }) {
  if (!canEdit) {
    return (
      <Card>
        <CardHeader title="Supply feeds" description="The sources this ward draws on, by gas." />
        {detail.feeds.length === 0 ? (
          <EmptyState title="No feeds set" className="py-6" />
        ) : (
          <ul className="divide-y divide-line">
            {detail.feeds.map((f) => (
              <li key={`${f.sourceId}-${f.role}`} className="flex flex-wrap items-center justify-between gap-2 px-4 py-3 sm:px-5">
                <Link to={`/sources/${f.sourceId}`} className="font-bold text-primary underline-offset-2 hover:underline">
                  {f.sourceName}
                </Link>
                <span className="text-sm text-fg-muted">
                  {gasName(f.gasCode)} · {FEED_ROLE_LABEL[f.role]}
                </span>
              </li>
            ))}
          </ul>
        )}
      </Card>
    );
  }
  return <FeedsForm key={detail.feeds.map((f) => `${f.sourceId}${f.role}`).join(',')} detail={detail} sources={sources} onSaved={onSaved} />;
}

function FeedsForm({ detail, sources, onSaved }: { detail: WardDetail; sources: SourceOption[]; onSaved?: () => void }) {
  const save = useSaveFeeds(detail.ward.id, onSaved);
  const [banner, setBanner] = useState<string | null>(null);
  const gasOf = (id: number) => sources.find((s) => s.id === id)?.gasCode ?? '';
  const { register, handleSubmit, setError, control, formState, reset } = useForm<FeedsFormValues, unknown, ReturnType<typeof wardFeedsSchema.parse>>({
    resolver: bodyResolver<FeedsFormValues, typeof wardFeedsSchema>(
      wardFeedsSchema,
      (v) => ({ feeds: v.feeds.map((f) => ({ sourceId: f.sourceId, gasCode: gasOf(f.sourceId), role: f.role })) }),
      (p) => p.replace(/^feeds\.(\d+)\.gasCode$/, 'feeds.$1.sourceId'),
    ),
    defaultValues: { feeds: detail.feeds.map((f) => ({ sourceId: f.sourceId, role: f.role })) },
  });
  const feeds = useFieldArray({ control, name: 'feeds' });
  const values = useWatch({ control, name: 'feeds' }) ?? [];
  const e = formState.errors;
  const byGas = [...new Set(sources.map((s) => s.gasCode))];

  const onSubmit = handleSubmit((body) => {
    setBanner(null);
    save.mutate(body.feeds, {
      onSuccess: () => {
        toast.ok('Feeds saved.');
        reset(undefined, { keepValues: true });
      },
      onError: (error) =>
        setBanner(applyServerErrors(error, (name, err) => setError(String(name).replace(/\.gasCode$/, '.sourceId') as never, err), ['feeds'])),
    });
  });

  return (
    <Card>
      <CardHeader title="Supply feeds" description="One primary source per gas carries the ward’s demand; secondary and reserve sources take over." />
      <form onSubmit={onSubmit} noValidate>
        <CardBody className="flex flex-col gap-3">
          {banner && (
            <Alert tone="critical" title="Not saved" role="alert">
              {banner}
            </Alert>
          )}
          {feeds.fields.length === 0 && <p className="text-fg-muted">No feeds: the ward’s demand is not counted against any source.</p>}
          <ul className="flex flex-col gap-3">
            {feeds.fields.map((f, i) => {
              const sid = values[i]?.sourceId;
              return (
                <li key={f.id} className="grid grid-cols-[minmax(0,1fr)_auto] items-start gap-x-2 gap-y-3 rounded-lg border border-line bg-surface-sunken p-3">
                  <Field
                    className="col-span-2"
                    label={`Source ${i + 1}`}
                    hint={sid && Number.isFinite(sid) ? gasName(gasOf(sid)) : undefined}
                    error={e.feeds?.[i]?.sourceId ? (e.feeds[i].sourceId.type === 'server' ? e.feeds[i].sourceId.message : 'choose a source') : undefined}
                  >
                    {(c) => (
                      <Select {...c} {...register(`feeds.${i}.sourceId`, { setValueAs: optionalId })}>
                        <option value="">Choose a source…</option>
                        {byGas.map((gas) => (
                          <optgroup key={gas} label={gasName(gas)}>
                            {sources
                              .filter((s) => s.gasCode === gas)
                              .map((s) => (
                                <option key={s.id} value={s.id}>
                                  {s.name}
                                  {s.active ? '' : ' (not in use)'}
                                </option>
                              ))}
                          </optgroup>
                        ))}
                      </Select>
                    )}
                  </Field>
                  <Field label="Role" error={e.feeds?.[i]?.role?.message}>
                    {(c) => (
                      <Select {...c} {...register(`feeds.${i}.role`)}>
                        {FEED_ROLES.map((r) => (
                          <option key={r} value={r}>
                            {FEED_ROLE_LABEL[r]}
                          </option>
                        ))}
                      </Select>
                    )}
                  </Field>
                  <Button variant="ghost" size="sm" className="mt-7" onClick={() => feeds.remove(i)} aria-label={`Remove feed ${i + 1}`}>
                    <Icon name="close" className="size-4" />
                    Remove
                  </Button>
                </li>
              );
            })}
          </ul>
          {e.feeds?.message && <p className="text-sm font-bold text-critical">{e.feeds.message}</p>}
          <div className="flex flex-wrap items-center gap-2">
            <Button
              variant="secondary"
              size="sm"
              onClick={() => feeds.append({ sourceId: BLANK, role: values.some((v) => v.role === 'primary') ? 'secondary' : 'primary' })}
            >
              <Icon name="plus" className="size-4" />
              Add a feed
            </Button>
          </div>
          <div className="flex flex-wrap items-center gap-2 border-t border-line pt-3">
            <Button type="submit" busy={save.isPending} disabled={!formState.isDirty}>
              Save feeds
            </Button>
            {formState.isDirty && (
              <Button variant="ghost" onClick={() => reset()}>
                Undo changes
              </Button>
            )}
          </div>
        </CardBody>
      </form>
    </Card>
  );
}
