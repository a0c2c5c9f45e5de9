import { useEffect, useMemo, useRef, useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { DateTime } from 'luxon';
import { wardLeadOnly, type Role } from '@common/api/roles';
import { usageReportUpdateSchema, type UsageCylinderLine, type UsageDeviceLine } from '@common/schemas/usage.schema';
import { errorMessage } from '@/lib/api-client';
import { formatDateTime, formatNumber } from '@/lib/format';
import { cn } from '@/lib/cn';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button, ButtonLink } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Field, Select, Textarea } from '@/components/ui/field';
import { Icon } from '@/components/ui/icons';
import { EmptyState, ErrorState, LoadingState } from '@/components/ui/states';
import { useEditReport, useFileReport, usageQueries, type FiledReport, type ReportScreenData, type UsageStatus } from '../api/usage-api';
import { Stepper } from './stepper';

const WARD_KEY = 'plenum.reportWardId';

function storedWard(): number | null {
  try {
    const v = Number(localStorage.getItem(WARD_KEY));
    return Number.isInteger(v) && v > 0 ? v : null;
  } catch {
    return null;
  }
}

const lowerFirst = (s: string) => s.charAt(0).toLowerCase() + s.slice(1);

/** "Wednesday 2 December" for a local date. */
export function dayLabel(date: string, today?: string): string {
  if (today && date === today) return `Today, ${DateTime.fromISO(date).toFormat('cccc d LLLL')}`;
  if (today && DateTime.fromISO(today).minus({ days: 1 }).toISODate() === date) return `Yesterday, ${DateTime.fromISO(date).toFormat('cccc d LLLL')}`;
  return DateTime.fromISO(date).toFormat('cccc d LLLL yyyy');
}

/**
 * The ward lead's daily report, phone first: pick the ward (remembered), the day (today by default),
 * then patients on each oxygen device now and at most during the shift, cylinders used and returned,
 * a note — prefilled from the last report — and one big button. A facilities manager also sees which
 * wards have filed today.
 */
export function DailyReportScreen({ site, roles }: { site: { id: number; name: string; timeZone: string }; roles: readonly Role[] }) {
  const status = useQuery(usageQueries.status(site.id));
  const [chosen, setChosen] = useState<number | null>(storedWard);
  const [date, setDate] = useState<string | undefined>(undefined);
  const manager = roles.includes('facilities_manager');
  const wards = status.data?.wards ?? [];
  const wardId = wards.find((w) => w.wardId === chosen)?.wardId ?? wards.find((w) => w.reportId === null)?.wardId ?? wards[0]?.wardId ?? null;
  // The ward first shown stays put (filing it must not move the screen to the next ward without a report).
  useEffect(() => {
    if (wardId !== null && chosen !== wardId) setChosen(wardId);
  }, [wardId, chosen]);

  const choose = (id: number) => {
    setChosen(id);
    setDate(undefined);
    try {
      localStorage.setItem(WARD_KEY, String(id));
    } catch {
      // private mode: remembered for this page only
    }
  };

  if (status.isPending)
    return (
      <Card>
        <LoadingState label="Loading the wards…" />
      </Card>
    );
  if (status.isError)
    return (
      <Card>
        <ErrorState error={status.error} onRetry={() => status.refetch()} />
      </Card>
    );
  if ((!wards.length || wardId === null) && wardLeadOnly(roles)) {
    return (
      <Card>
        <EmptyState title="No wards granted to you yet">
          You report for the wards an administrator grants you. Ask an administrator to grant your wards.
        </EmptyState>
      </Card>
    );
  }
  if (!wards.length || wardId === null) {
    return (
      <Card>
        <EmptyState title="No wards at this site yet">A facilities manager adds the wards and their demand model; then each ward reports here.</EmptyState>
      </Card>
    );
  }
  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-col gap-3 sm:flex-row sm:items-end">
        <Field label="Ward" className="flex-1">
          {(p) => (
            <Select {...p} value={wardId} onChange={(e) => choose(Number(e.target.value))} className="min-h-12 text-lg font-bold">
              {wards.map((w) => (
                <option key={w.wardId} value={w.wardId}>
                  {w.name}
                  {w.reportId ? ' ✓ filed' : ''}
                </option>
              ))}
            </Select>
          )}
        </Field>
        <ButtonLink to="/cylinder-check" variant="secondary" size="lg" className="w-full sm:w-auto">
          <Icon name="cylinder" />
          Cylinder check
        </ButtonLink>
      </div>
      <ReportPanel key={`${wardId}|${date ?? ''}`} wardId={wardId} date={date} onDate={setDate} manager={manager} timeZone={site.timeZone} />
      {manager && <StatusBoard status={status.data} current={wardId} onPick={choose} />}
    </div>
  );
}

function ReportPanel({
  wardId,
  date,
  onDate,
  manager,
  timeZone,
}: {
  wardId: number;
  date: string | undefined;
  onDate: (d: string | undefined) => void;
  manager: boolean;
  timeZone: string;
}) {
  const q = useQuery(usageQueries.ward(wardId, date));
  const [filed, setFiled] = useState<{ report: FiledReport; created: boolean } | null>(null);
  if (q.isPending)
    return (
      <Card>
        <LoadingState label="Loading the report…" />
      </Card>
    );
  if (q.isError)
    return (
      <Card>
        <ErrorState error={q.error} onRetry={() => q.refetch()} />
      </Card>
    );
  const d = q.data;
  return (
    <div className="flex flex-col gap-4">
      <DayPicker data={d} onDate={onDate} manager={manager} />
      {filed ? (
        <Confirmation data={d} filed={filed.report} created={filed.created} timeZone={timeZone} onChange={() => setFiled(null)} />
      ) : d.report && !d.report.canEdit ? (
        <ReadOnlyReport data={d} report={d.report} timeZone={timeZone} />
      ) : d.report || d.canCreate ? (
        <ReportForm
          key={d.report ? `edit-${d.report.id}-${d.report.updatedAt}` : `new-${d.date}`}
          data={d}
          timeZone={timeZone}
          onFiled={(report, created) => setFiled({ report, created })}
        />
      ) : (
        <Alert tone="info" title={`No report for ${dayLabel(d.date, d.today)}`}>
          {d.createRule}
        </Alert>
      )}
      <RecentDays data={d} onDate={onDate} />
    </div>
  );
}

function DayPicker({ data, onDate, manager }: { data: ReportScreenData; onDate: (d: string | undefined) => void; manager: boolean }) {
  const days = [0, 1, 2, 3].map((n) => DateTime.fromISO(data.today).minus({ days: n }).toISODate()!);
  return (
    <div className="flex flex-wrap items-center gap-2" role="group" aria-label="Day of the report">
      {days.map((day, i) => (
        <button
          key={day}
          type="button"
          aria-pressed={day === data.date}
          onClick={() => onDate(i === 0 ? undefined : day)}
          className={cn(
            'min-h-11 rounded-full border px-3.5 font-bold',
            day === data.date ? 'border-primary bg-primary text-primary-fg' : 'border-line-strong bg-surface text-primary hover:bg-primary-soft',
          )}
        >
          {i === 0 ? 'Today' : i === 1 ? 'Yesterday' : DateTime.fromISO(day).toFormat('ccc d')}
        </button>
      ))}
      {manager && (
        <input
          type="date"
          aria-label="Another day"
          max={data.today}
          value={days.includes(data.date) ? '' : data.date}
          onChange={(e) => e.target.value && onDate(e.target.value)}
          className="min-h-11 rounded-lg border border-line-strong bg-surface px-3"
        />
      )}
    </div>
  );
}

interface Draft {
  devices: UsageDeviceLine[];
  cylinders: UsageCylinderLine[];
  note: string;
}

function ReportForm({ data, timeZone, onFiled }: { data: ReportScreenData; timeZone: string; onFiled: (r: FiledReport, created: boolean) => void }) {
  const editing = data.report;
  const initial: Draft = editing
    ? { devices: editing.devices, cylinders: editing.cylinders, note: editing.note }
    : { devices: data.draft!.devices, cylinders: data.draft!.cylinders, note: data.draft!.note };
  // Devices on show: the report's, and those the ward's model has patients on; others can be added.
  const [shown, setShown] = useState<string[]>(() => {
    const list = new Set(initial.devices.map((x) => x.device as string));
    for (const dv of data.devices) if (dv.modelPatients > 0) list.add(dv.device);
    return data.devices.map((dv) => dv.device as string).filter((dv) => list.has(dv));
  });
  const [devices, setDevices] = useState<Record<string, { now: number; shift: number }>>(() =>
    Object.fromEntries(initial.devices.map((x) => [x.device, { now: x.patientsNow, shift: x.patientsShift }])),
  );
  const [cylinders, setCylinders] = useState<UsageCylinderLine[]>(initial.cylinders);
  const [note, setNote] = useState(initial.note);
  const [errors, setErrors] = useState<Record<string, string>>({});
  const [banner, setBanner] = useState<string | null>(null);
  const file = useFileReport(data.ward.id);
  const edit = useEditReport(editing?.id ?? 0);
  const busy = file.isPending || edit.isPending;
  const previousCyl = new Map((data.previous?.cylinders ?? []).map((c) => [c.cylinderTypeId, c]));

  const setCount = (device: string, key: 'now' | 'shift', n: number) =>
    setDevices((cur) => {
      const v = cur[device] ?? { now: 0, shift: 0 };
      const next = { ...v, [key]: n };
      // the most during the shift is at least the number now
      if (key === 'now' && next.shift < n) next.shift = n;
      return { ...cur, [device]: next };
    });

  const body = (): Draft => ({
    devices: shown.map((device) => ({
      device: device as UsageDeviceLine['device'],
      patientsNow: devices[device]?.now ?? 0,
      patientsShift: devices[device]?.shift ?? 0,
    })),
    cylinders,
    note,
  });

  const submit = async () => {
    setBanner(null);
    const parsed = usageReportUpdateSchema.safeParse(body());
    if (!parsed.success) {
      setErrors(Object.fromEntries(parsed.error.issues.map((i) => [i.path.join('.'), i.message])));
      setBanner('Please correct the marked counts.');
      return;
    }
    setErrors({});
    try {
      if (editing) onFiled(await edit.mutateAsync(parsed.data), false);
      else onFiled(await file.mutateAsync({ date: data.date, ...parsed.data }), true);
    } catch (e) {
      const details = (e as { details?: { path: string; message: string }[] }).details;
      if (details?.length) setErrors(Object.fromEntries(details.map((x) => [x.path, x.message])));
      setBanner(errorMessage(e));
    }
  };

  const unusedDevices = data.devices.filter((dv) => !shown.includes(dv.device));
  const unusedTypes = data.cylinderTypes.filter((t) => !cylinders.some((c) => c.cylinderTypeId === t.id));
  const typeName = (id: number) => data.cylinderTypes.find((t) => t.id === id)?.name ?? `Cylinder type ${id}`;

  return (
    <form
      className="flex flex-col gap-4"
      onSubmit={(e) => {
        e.preventDefault();
        void submit();
      }}
      aria-label={`Usage report, ${data.ward.name}, ${dayLabel(data.date, data.today)}`}
    >
      {editing ? (
        <Alert tone="info" title={`Filed ${formatDateTime(editing.submittedAt, timeZone)}${editing.submittedBy ? ` by ${editing.submittedBy}` : ''}`}>
          You can change it until {formatDateTime(editing.editableUntil, timeZone)}. Every change is recorded.
        </Alert>
      ) : data.draft?.prefilledFrom ? (
        <Alert tone="watch" title={`Prefilled from ${lowerFirst(dayLabel(data.draft.prefilledFrom, data.today))}`}>
          Check each count against the ward now, then file. Cylinders start at 0 (yesterday’s numbers are shown as hints).
        </Alert>
      ) : (
        <Alert tone="info" title="First report for this ward">
          The counts start from the ward’s demand model. Check them against the ward now.
        </Alert>
      )}
      {banner && (
        <Alert tone="critical" role="alert" title="Not filed yet">
          {banner}
        </Alert>
      )}

      <Card>
        <CardHeader title="Patients on oxygen" description="Now, and the most at any one time during this shift." />
        <CardBody className="flex flex-col divide-y divide-line p-0 sm:p-0">
          {shown.map((device, i) => {
            const meta = data.devices.find((dv) => dv.device === device)!;
            const v = devices[device] ?? { now: 0, shift: 0 };
            const err = errors[`devices.${i}.patientsShift`] ?? errors[`devices.${i}.patientsNow`];
            return (
              <div key={device} className="flex flex-col gap-3 px-4 py-4 sm:px-5">
                <div className="flex flex-wrap items-baseline justify-between gap-2">
                  <h3 className="text-base font-bold">{meta.label}</h3>
                  <span className="text-xs text-fg-muted">
                    {formatNumber(meta.flowLMin, 1)} L/min · model {formatNumber(meta.modelPatients, 1)}
                  </span>
                </div>
                <div className="grid grid-cols-1 gap-2 md:grid-cols-2 md:gap-6">
                  <Stepper label="Now" value={v.now} onChange={(n) => setCount(device, 'now', n)} />
                  <Stepper label="Most this shift" value={v.shift} onChange={(n) => setCount(device, 'shift', n)} />
                </div>
                {err && <p className="text-sm font-bold text-critical">{err}</p>}
              </div>
            );
          })}
          {unusedDevices.length > 0 && (
            <div className="px-4 py-3 sm:px-5">
              <Field label="Another device">
                {(p) => (
                  <Select
                    {...p}
                    value=""
                    onChange={(e) =>
                      e.target.value && setShown((s) => data.devices.map((dv) => dv.device as string).filter((dv) => s.includes(dv) || dv === e.target.value))
                    }
                  >
                    <option value="">Add a device…</option>
                    {unusedDevices.map((dv) => (
                      <option key={dv.device} value={dv.device}>
                        {dv.label}
                      </option>
                    ))}
                  </Select>
                )}
              </Field>
            </div>
          )}
        </CardBody>
      </Card>

      <Card>
        <CardHeader title="Cylinders" description="Changed (used) on the ward today, and sent back to the store." />
        <CardBody className="flex flex-col divide-y divide-line p-0 sm:p-0">
          {cylinders.length === 0 && <p className="px-4 py-4 text-fg-muted sm:px-5">No cylinders listed. Add a type if the ward changed or returned any.</p>}
          {cylinders.map((c, i) => {
            const prev = previousCyl.get(c.cylinderTypeId);
            return (
              <div key={c.cylinderTypeId} className="flex flex-col gap-3 px-4 py-4 sm:px-5">
                <div className="flex flex-wrap items-baseline justify-between gap-2">
                  <h3 className="text-base font-bold">{typeName(c.cylinderTypeId)}</h3>
                  {prev && data.previous && (
                    <span className="text-xs text-fg-muted">
                      last report: {prev.used} used, {prev.returned} returned
                    </span>
                  )}
                </div>
                <div className="grid grid-cols-1 gap-2 md:grid-cols-2 md:gap-6">
                  <Stepper
                    label="Used"
                    max={1000}
                    value={c.used}
                    onChange={(n) => setCylinders((all) => all.map((x, k) => (k === i ? { ...x, used: n } : x)))}
                  />
                  <Stepper
                    label="Returned"
                    max={1000}
                    value={c.returned}
                    onChange={(n) => setCylinders((all) => all.map((x, k) => (k === i ? { ...x, returned: n } : x)))}
                  />
                </div>
              </div>
            );
          })}
          {unusedTypes.length > 0 && (
            <div className="px-4 py-3 sm:px-5">
              <Field label="Another cylinder type">
                {(p) => (
                  <Select
                    {...p}
                    value=""
                    onChange={(e) => e.target.value && setCylinders((all) => [...all, { cylinderTypeId: Number(e.target.value), used: 0, returned: 0 }])}
                  >
                    <option value="">Add a cylinder type…</option>
                    {unusedTypes.map((t) => (
                      <option key={t.id} value={t.id}>
                        {t.name}
                      </option>
                    ))}
                  </Select>
                )}
              </Field>
            </div>
          )}
        </CardBody>
      </Card>

      <Field label="Note (optional)" hint="Anything the facilities team should know: a surge, a leak, a missing delivery." error={errors.note}>
        {(p) => <Textarea {...p} rows={2} maxLength={1000} value={note} onChange={(e) => setNote(e.target.value)} />}
      </Field>

      <div className="sticky bottom-0 z-10 -mx-4 border-t border-line bg-canvas/95 px-4 py-3 backdrop-blur sm:static sm:mx-0 sm:border-0 sm:bg-transparent sm:px-0 sm:py-0">
        <Button type="submit" size="lg" busy={busy} className="w-full">
          <Icon name="check" />
          {editing ? 'Save the changes' : `File the report for ${data.date === data.today ? 'today' : DateTime.fromISO(data.date).toFormat('ccc d LLL')}`}
        </Button>
      </div>
    </form>
  );
}

function Confirmation({
  data,
  filed,
  created,
  timeZone,
  onChange,
}: {
  data: ReportScreenData;
  filed: FiledReport;
  created: boolean;
  timeZone: string;
  onChange: () => void;
}) {
  const ref = useRef<HTMLDivElement>(null);
  useEffect(() => {
    ref.current?.focus();
    ref.current?.scrollIntoView({ block: 'start', behavior: 'smooth' });
  }, []);
  const patients = filed.devices.reduce((s, x) => s + x.patientsNow, 0);
  const used = filed.cylinders.reduce((s, x) => s + x.used, 0);
  return (
    <div ref={ref} tabIndex={-1} role="status" className="flex flex-col gap-4 rounded-card border-2 border-ok bg-ok-soft p-5 outline-none">
      <div className="flex items-start gap-3">
        <span className="flex size-12 shrink-0 items-center justify-center rounded-full bg-ok text-white">
          <Icon name="check" className="size-7" />
        </span>
        <div>
          <h2 className="text-2xl">{created ? 'Report filed' : 'Changes saved'}</h2>
          <p className="text-lg">
            {data.ward.name} · {dayLabel(filed.date, data.today)}
          </p>
        </div>
      </div>
      <dl className="grid grid-cols-2 gap-3 text-sm sm:grid-cols-4">
        <div>
          <dt className="text-fg-muted">Patients on oxygen now</dt>
          <dd className="text-xl font-bold tabular">{patients}</dd>
        </div>
        <div>
          <dt className="text-fg-muted">Cylinders used</dt>
          <dd className="text-xl font-bold tabular">{used}</dd>
        </div>
        <div>
          <dt className="text-fg-muted">Filed</dt>
          <dd className="font-bold">{formatDateTime(filed.submittedAt, timeZone)}</dd>
        </div>
        <div>
          <dt className="text-fg-muted">Can be changed until</dt>
          <dd className="font-bold">{formatDateTime(filed.editableUntil, timeZone)}</dd>
        </div>
      </dl>
      <div className="flex flex-col gap-2 sm:flex-row">
        <Button variant="secondary" size="lg" onClick={onChange} className="w-full sm:w-auto">
          <Icon name="pencil" />
          Change it
        </Button>
        <ButtonLink to="/cylinder-check" size="lg" className="w-full sm:w-auto">
          <Icon name="cylinder" />
          Cylinder check
        </ButtonLink>
      </div>
    </div>
  );
}

function ReadOnlyReport({ data, report, timeZone }: { data: ReportScreenData; report: FiledReport; timeZone: string }) {
  const label = (device: string) => data.devices.find((dv) => dv.device === device)?.label ?? device;
  const typeName = (id: number) => data.cylinderTypes.find((t) => t.id === id)?.name ?? `Cylinder type ${id}`;
  return (
    <Card>
      <CardHeader title={`Filed ${formatDateTime(report.submittedAt, timeZone)}`} description={report.submittedBy ? `by ${report.submittedBy}` : undefined} />
      <CardBody className="flex flex-col gap-3">
        {report.reason && (
          <Alert tone="info" title="This report can no longer be changed here">
            {report.reason}
          </Alert>
        )}
        <ul className="flex flex-col gap-1">
          {report.devices.map((x) => (
            <li key={x.device} className="flex justify-between gap-3">
              <span>{label(x.device)}</span>
              <span className="tabular font-bold">
                {x.patientsNow} now · {x.patientsShift} most
              </span>
            </li>
          ))}
          {report.cylinders.map((c) => (
            <li key={c.cylinderTypeId} className="flex justify-between gap-3">
              <span>{typeName(c.cylinderTypeId)}</span>
              <span className="tabular font-bold">
                {c.used} used · {c.returned} returned
              </span>
            </li>
          ))}
        </ul>
        {report.note && <p className="text-fg-muted">“{report.note}”</p>}
      </CardBody>
    </Card>
  );
}

function RecentDays({ data, onDate }: { data: ReportScreenData; onDate: (d: string | undefined) => void }) {
  const days = useMemo(() => [0, 1, 2, 3, 4, 5, 6].map((n) => DateTime.fromISO(data.today).minus({ days: n }).toISODate()!), [data.today]);
  return (
    <Card>
      <CardHeader title="The last seven days" headingLevel={2} />
      <ul className="divide-y divide-line">
        {days.map((day, i) => {
          const r = data.recent.find((x) => x.date === day);
          return (
            <li key={day}>
              <button
                type="button"
                onClick={() => onDate(i === 0 ? undefined : day)}
                className="flex min-h-12 w-full items-center justify-between gap-3 px-4 py-2 text-left hover:bg-primary-soft sm:px-5"
              >
                <span className={cn(day === data.date && 'font-bold')}>{i === 0 ? 'Today' : DateTime.fromISO(day).toFormat('ccc d LLL')}</span>
                {r ? (
                  <Badge tone="ok" icon="check">
                    {r.patientsNow} pts · {r.cylindersUsed} cyl
                  </Badge>
                ) : (
                  <Badge tone={i === 0 ? 'neutral' : 'watch'} icon={i === 0 ? 'clock' : 'alert'}>
                    {i === 0 ? 'Not yet' : 'Missing'}
                  </Badge>
                )}
              </button>
            </li>
          );
        })}
      </ul>
    </Card>
  );
}

function StatusBoard({ status, current, onPick }: { status: UsageStatus; current: number; onPick: (id: number) => void }) {
  const filed = status.wards.filter((w) => w.reportId !== null).length;
  return (
    <Card>
      <CardHeader
        title="Reports today"
        description={`${filed} of ${status.wards.length} wards have filed for ${dayLabel(status.date)}. A reminder goes out at ${status.reminderLocalTime} site time to wards that have not.`}
      />
      <ul className="divide-y divide-line">
        {status.wards.map((w) => (
          <li key={w.wardId}>
            <button
              type="button"
              onClick={() => onPick(w.wardId)}
              aria-current={w.wardId === current || undefined}
              className="flex min-h-12 w-full items-center justify-between gap-3 px-4 py-2 text-left hover:bg-primary-soft aria-[current]:bg-primary-soft sm:px-5"
            >
              <span className="min-w-0 truncate">{w.name}</span>
              {w.reportId ? (
                <Badge tone="ok" icon="check">
                  Filed{w.submittedBy ? ` · ${w.submittedBy.split(' ')[0]}` : ''}
                </Badge>
              ) : (
                <Badge tone="watch" icon="clock">
                  Not yet
                </Badge>
              )}
            </button>
          </li>
        ))}
      </ul>
    </Card>
  );
}
