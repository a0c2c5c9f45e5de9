import { useEffect, useState, type ReactNode } from 'react';
import { useQuery, useQueryClient } from '@tanstack/react-query';
import type { ImportStatus } from '@common/schemas/usage.schema';
import { errorMessage } from '@/lib/api-client';
import { formatBytes, formatDateTime, formatNumber } from '@/lib/format';
import { Alert } from '@/components/ui/alert';
import { Badge, type Tone } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Dialog } from '@/components/ui/dialog';
import { Field, Select } from '@/components/ui/field';
import { Icon, type IconName } from '@/components/ui/icons';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { errorsUrl, importsQueries, isBusy, useCancel, useCommit, useRemap, type ImportJob } from '../api/imports-api';

export const STATUS_TEXT: Record<ImportStatus, { label: string; tone: Tone; icon: IconName }> = {
  mapping: { label: 'Columns to match', tone: 'watch', icon: 'pencil' },
  validating: { label: 'Checking', tone: 'info', icon: 'clock' },
  ready: { label: 'Ready to import', tone: 'ok', icon: 'check' },
  invalid: { label: 'Errors in the file', tone: 'critical', icon: 'alert' },
  queued: { label: 'Waiting to import', tone: 'info', icon: 'clock' },
  running: { label: 'Importing', tone: 'info', icon: 'clock' },
  done: { label: 'Imported', tone: 'ok', icon: 'check' },
  failed: { label: 'Failed, nothing written', tone: 'critical', icon: 'alert' },
  cancelled: { label: 'Cancelled', tone: 'neutral', icon: 'close' },
};

export function StatusBadge({ status }: { status: ImportStatus }) {
  const s = STATUS_TEXT[status];
  return (
    <Badge tone={s.tone} icon={s.icon}>
      {s.label}
    </Badge>
  );
}

function Table({ caption, head, rows }: { caption: string; head: string[]; rows: ReactNode[][] }) {
  return (
    <div className="w-full overflow-x-auto rounded-lg border border-line">
      <table className="w-full border-collapse text-sm">
        <caption className="sr-only">{caption}</caption>
        <thead className="bg-surface-sunken">
          <tr>
            {head.map((h) => (
              <th key={h} scope="col" className="px-3 py-2 text-left font-bold whitespace-nowrap">
                {h}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {rows.map((r, i) => (
            <tr key={i} className="border-t border-line">
              {r.map((c, k) => (
                <td key={k} className="px-3 py-2 align-top break-words">
                  {c}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

/** The worker's progress, as a bar with the numbers in words (it lives in the database: a reload finds it). */
export function ProgressBar({ job }: { job: ImportJob }) {
  const pct = Math.round(job.progress * 100);
  const what = job.phase === 'check' ? 'Checking every row' : job.status === 'queued' ? 'Waiting for the import to start' : 'Importing';
  return (
    <div className="flex flex-col gap-2">
      <div className="flex justify-between text-sm">
        <span className="font-bold">{what}</span>
        <span className="tabular">
          {formatNumber(job.processedRows)} of {formatNumber(job.totalRows)} rows · {pct} %
        </span>
      </div>
      <div
        role="progressbar"
        aria-label={what}
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={pct}
        className="h-4 w-full overflow-hidden rounded-full border border-line-strong bg-surface-sunken"
      >
        <div className="h-full bg-primary transition-[width] duration-700" style={{ width: `${Math.max(2, pct)}%` }} />
      </div>
    </div>
  );
}

/**
 * One upload from check to import: the column mapping when headers differ, the check's progress, a
 * preview of the first rows with the first errors (row, column, value, reason), the confirmation, the
 * import's progress with cancel, and the outcome.
 */
export function JobPanel({ id, onNew }: { id: number; onNew: () => void }) {
  const q = useQuery(importsQueries.job(id));
  const qc = useQueryClient();
  const status = q.data?.status;
  const siteId = q.data?.siteId;
  // When the worker finishes (or a reload finds it finished), the list of uploads says so too.
  useEffect(() => {
    if (siteId !== undefined && status !== undefined && !isBusy(status)) void qc.invalidateQueries({ queryKey: importsQueries.list(siteId).queryKey });
  }, [status, siteId, qc]);
  const commit = useCommit(id);
  const cancel = useCancel(id);
  const [askCancel, setAskCancel] = useState(false);
  const [problem, setProblem] = useState<string | null>(null);
  if (q.isPending)
    return (
      <Card>
        <LoadingState label="Loading the upload…" />
      </Card>
    );
  if (q.isError)
    return (
      <Card>
        <ErrorState error={q.error} onRetry={() => q.refetch()} />
      </Card>
    );
  const job = q.data;
  const act = async (fn: () => Promise<unknown>) => {
    setProblem(null);
    try {
      await fn();
    } catch (e) {
      setProblem(errorMessage(e));
    }
  };

  return (
    <Card>
      <CardHeader
        title={job.file?.name ?? `Upload ${job.id}`}
        description={`${job.kindLabel}${job.file ? ` · ${formatBytes(job.file.sizeBytes)} · ${formatNumber(Math.max(0, job.file.lines - 1))} lines` : ''} · uploaded ${formatDateTime(job.createdAt)}`}
        actions={<StatusBadge status={job.status} />}
      />
      <CardBody className="flex flex-col gap-4">
        {problem && (
          <Alert tone="critical" role="alert" title="That did not work">
            {problem}
          </Alert>
        )}
        {job.status === 'mapping' && <MappingForm job={job} />}
        {isBusy(job.status) && (
          <>
            <ProgressBar job={job} />
            {job.status !== 'validating' && (
              <div>
                <Button variant="secondary" onClick={() => setAskCancel(true)} disabled={job.cancelRequested}>
                  <Icon name="close" />
                  {job.cancelRequested ? 'Cancelling…' : 'Cancel the import'}
                </Button>
              </div>
            )}
          </>
        )}
        {job.message && !isBusy(job.status) && job.status !== 'mapping' && (
          <Alert tone={job.status === 'done' || job.status === 'ready' ? 'ok' : job.status === 'cancelled' ? 'info' : 'critical'} role="status">
            {job.message}
          </Alert>
        )}
        {job.preview && job.preview.rows.length > 0 && (job.status === 'ready' || job.status === 'invalid') && <Preview job={job} />}
        {job.errors.length > 0 && (
          <div className="flex flex-col gap-2">
            <h3 className="text-base font-bold">
              {job.errorCount > job.errors.length
                ? `The first ${job.errors.length} of ${formatNumber(job.errorCount)} errors`
                : `${job.errors.length} error${job.errors.length === 1 ? '' : 's'}`}
            </h3>
            <div className="hidden sm:block">
              <Table
                caption="Errors in the file"
                head={['Row', 'Column', 'Value', 'What is wrong']}
                rows={job.errors.map((e) => [
                  e.row ? formatNumber(e.row) : '–',
                  e.column,
                  e.value ? <code className="break-all">{e.value}</code> : <span className="text-fg-muted">(empty)</span>,
                  e.reason,
                ])}
              />
            </div>
            {/* phones: one line of words per error instead of a four-column table */}
            <ul className="flex flex-col divide-y divide-line rounded-lg border border-line sm:hidden" aria-label="Errors in the file">
              {job.errors.map((e, i) => (
                <li key={i} className="px-3 py-2 text-sm">
                  <span className="font-bold">
                    Row {e.row ? formatNumber(e.row) : '–'}
                    {e.column ? `, ${e.column}` : ''}
                  </span>
                  {e.value ? (
                    <>
                      {' '}
                      <code className="break-all">{e.value}</code>
                    </>
                  ) : null}
                  <span className="block text-fg">{e.reason}</span>
                </li>
              ))}
            </ul>
            <a href={errorsUrl(job.id)} download className="inline-flex min-h-11 items-center gap-2 font-bold text-primary hover:underline">
              <Icon name="download" />
              Download the errors (CSV)
            </a>
          </div>
        )}
        <div className="flex flex-wrap gap-2">
          {job.canCommit && (
            <Button size="lg" busy={commit.isPending} onClick={() => act(() => commit.mutateAsync(false))}>
              <Icon name="check" />
              Import {formatNumber(job.totalRows)} rows
            </Button>
          )}
          {(job.status === 'ready' || job.status === 'invalid' || job.status === 'failed') && job.canRemap && <RemapButton job={job} />}
          {job.canCancel && !isBusy(job.status) && (
            <Button variant="secondary" busy={cancel.isPending} onClick={() => act(() => cancel.mutateAsync())}>
              Discard this upload
            </Button>
          )}
          {!isBusy(job.status) && (
            <Button variant="ghost" onClick={onNew}>
              <Icon name="upload" />
              Upload another file
            </Button>
          )}
        </div>
      </CardBody>
      <Dialog
        open={askCancel}
        onClose={() => setAskCancel(false)}
        title="Cancel the import?"
        footer={
          <>
            <Button variant="secondary" onClick={() => setAskCancel(false)}>
              Keep importing
            </Button>
            <Button
              variant="danger"
              busy={cancel.isPending}
              onClick={() =>
                act(async () => {
                  await cancel.mutateAsync();
                  setAskCancel(false);
                })
              }
            >
              Cancel the import
            </Button>
          </>
        }
      >
        <p>The import runs in one transaction: cancelling rolls it back, and none of its rows are kept. You can upload the file again later.</p>
      </Dialog>
    </Card>
  );
}

function Preview({ job }: { job: ImportJob }) {
  const p = job.preview!;
  return (
    <div className="flex flex-col gap-2">
      <h3 className="text-base font-bold">The first rows, as they will be stored</h3>
      <p className="text-sm text-fg-muted">
        {p.firstAt && p.lastAt ? `From ${formatDateTime(p.firstAt)} to ${formatDateTime(p.lastAt)}` : ''}
        {p.targets.length ? ` · ${p.targets.map((t) => `${t.name}: ${formatNumber(t.rows)} rows`).join(' · ')}` : ''}
      </p>
      <div className="hidden sm:block">
        <Table
          caption="Preview of the first rows"
          head={['Row', 'Time (site)', 'Goes to', 'Reading', 'Contents']}
          rows={p.rows.map((r) => [formatNumber(r.row), r.time, r.target ?? '', r.reading, r.contents ?? '–'])}
        />
      </div>
      <div className="sm:hidden">
        <Table
          caption="Preview of the first rows"
          head={['Row', 'Time (site)', 'Reading']}
          rows={p.rows.map((r) => [formatNumber(r.row), r.time, `${r.reading}${r.contents ? ` = ${r.contents}` : ''}`])}
        />
      </div>
    </div>
  );
}

function RemapButton({ job }: { job: ImportJob }) {
  const [open, setOpen] = useState(false);
  return (
    <>
      <Button variant="secondary" onClick={() => setOpen(true)}>
        <Icon name="pencil" />
        Change the column matching
      </Button>
      <Dialog open={open} onClose={() => setOpen(false)} title="Match the columns" wide>
        <MappingForm job={job} onDone={() => setOpen(false)} />
      </Dialog>
    </>
  );
}

/** Which header of the file holds which column (when the headers differ from the template). */
function MappingForm({ job, onDone }: { job: ImportJob; onDone?: () => void }) {
  const [mapping, setMapping] = useState<Record<string, string>>(job.mapping);
  const [unit, setUnit] = useState(job.options.unit ?? '');
  const [dateOrder, setDateOrder] = useState(job.options.dateOrder);
  const [target, setTarget] = useState(job.options.sourceId ? `s${job.options.sourceId}` : job.options.wardId ? `w${job.options.wardId}` : '');
  const [problem, setProblem] = useState<string | null>(null);
  const remap = useRemap(job.id);
  const sources = useQuery(importsQueries.sources(job.siteId));
  const wards = useQuery(importsQueries.wards(job.siteId));
  const fitting = (sources.data ?? []).filter((x) =>
    job.kind === 'tank_readings'
      ? x.type === 'bulk_liquid'
      : job.kind === 'store_counts'
        ? x.type === 'cylinder_store' || x.type === 'emergency_reserve'
        : true,
  );
  const submit = async () => {
    setProblem(null);
    const clean = Object.fromEntries(Object.entries(mapping).filter(([, h]) => h));
    try {
      await remap.mutateAsync({
        mapping: clean,
        unit: unit || undefined,
        dateOrder,
        sourceId: target.startsWith('s') ? Number(target.slice(1)) : undefined,
        wardId: target.startsWith('w') ? Number(target.slice(1)) : undefined,
      });
      onDone?.();
    } catch (e) {
      setProblem(errorMessage(e));
    }
  };
  return (
    <form
      className="flex flex-col gap-4"
      onSubmit={(e) => {
        e.preventDefault();
        void submit();
      }}
    >
      {job.message && (
        <Alert tone="watch" title="Before the rows can be checked">
          {job.message}
        </Alert>
      )}
      {problem && (
        <Alert tone="critical" role="alert">
          {problem}
        </Alert>
      )}
      <div className="grid gap-3 sm:grid-cols-2">
        {job.columns.map((c) => (
          <Field key={c.key} label={`${c.label}${c.required ? '' : ' (optional)'}`} hint={c.description}>
            {(p) => (
              <Select {...p} value={mapping[c.key] ?? ''} onChange={(e) => setMapping((m) => ({ ...m, [c.key]: e.target.value }))}>
                <option value="">{c.required ? 'Choose the file’s column…' : 'Not in the file'}</option>
                {job.header.map((h) => (
                  <option key={h} value={h}>
                    {h}
                  </option>
                ))}
              </Select>
            )}
          </Field>
        ))}
        {job.kind !== 'historic_usage' && (
          <Field
            label={job.kind === 'tank_readings' ? 'Tank' : job.kind === 'store_counts' ? 'Cylinder store' : 'Meter on'}
            hint={job.kind === 'flow_meter_totals' ? 'The ward or source the meter measures.' : 'Used where the file has no Tank / Store column.'}
          >
            {(p) => (
              <Select {...p} value={target} onChange={(e) => setTarget(e.target.value)}>
                <option value="">{job.kind === 'flow_meter_totals' ? 'Choose…' : 'From the file'}</option>
                {job.kind === 'flow_meter_totals' &&
                  (wards.data ?? []).map((w) => (
                    <option key={`w${w.id}`} value={`w${w.id}`}>
                      {w.name}
                    </option>
                  ))}
                {fitting.map((x) => (
                  <option key={`s${x.id}`} value={`s${x.id}`}>
                    {x.name}
                  </option>
                ))}
              </Select>
            )}
          </Field>
        )}
        {job.kind !== 'store_counts' && !mapping.unit && (
          <Field label="Unit of every row" hint="When the file has no unit column.">
            {(p) => (
              <Select {...p} value={unit} onChange={(e) => setUnit(e.target.value)}>
                <option value="">{job.options.headerUnit ? `From the header (${job.options.headerUnit})` : 'Choose…'}</option>
                {(job.kind === 'tank_readings' ? ['%', 'kg', 'L'] : ['m3', 'L']).map((u) => (
                  <option key={u} value={u}>
                    {u === 'L' && job.kind === 'tank_readings' ? 'L of liquid' : u === 'm3' ? 'm³' : u}
                  </option>
                ))}
              </Select>
            )}
          </Field>
        )}
        <Field label="Dates written as">
          {(p) => (
            <Select {...p} value={dateOrder} onChange={(e) => setDateOrder(e.target.value as 'ymd' | 'dmy' | 'mdy')}>
              <option value="ymd">2027-01-31</option>
              <option value="dmy">31/01/2027 (day first)</option>
              <option value="mdy">01/31/2027 (month first)</option>
            </Select>
          )}
        </Field>
      </div>
      {job.sample.length > 0 && (
        <div className="flex flex-col gap-2">
          <h3 className="text-base font-bold">The file’s first lines</h3>
          <Table caption="The first lines of the file" head={job.header} rows={job.sample.slice(0, 5).map((r) => job.header.map((_, i) => r[i] ?? ''))} />
        </div>
      )}
      <div>
        <Button type="submit" size="lg" busy={remap.isPending}>
          Check the rows
        </Button>
      </div>
    </form>
  );
}
