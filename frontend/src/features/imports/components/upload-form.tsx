import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { IMPORT_KINDS, IMPORT_KIND_LABELS, type ImportKind } from '@common/schemas/usage.schema';
import { ApiError, errorMessage } from '@/lib/api-client';
import { formatBytes } from '@/lib/format';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Dialog } from '@/components/ui/dialog';
import { Field, Input, Select } from '@/components/ui/field';
import { Icon } from '@/components/ui/icons';
import { importsQueries, templateUrl, useUpload, type ImportJob, type UploadInput } from '../api/imports-api';

const KIND_HELP: Record<ImportKind, string> = {
  tank_readings: 'Level telemetry or readings of a bulk tank: time and level in %, kg, litres of liquid or the tank’s differential-pressure unit.',
  flow_meter_totals: 'Running totals of a flow meter on a ward’s branch (or a source’s outlet), in m³ or L of free gas.',
  store_counts: 'Full, in-use and empty cylinders counted in a store, round by round.',
  historic_usage: 'Daily use per ward and gas from older records, in L or m³ of free gas.',
};

/** Units offered when the file has no unit column. */
function unitsFor(kind: ImportKind, calibrationUnit: string | null): { value: string; label: string }[] {
  if (kind === 'tank_readings')
    return [
      { value: '%', label: '% level' },
      { value: 'kg', label: 'kg' },
      { value: 'L', label: 'L of liquid' },
      ...(calibrationUnit ? [{ value: calibrationUnit, label: `${calibrationUnit} (differential pressure)` }] : []),
    ];
  if (kind === 'flow_meter_totals' || kind === 'historic_usage')
    return [
      { value: 'm3', label: 'm³ of free gas' },
      { value: 'L', label: 'L of free gas' },
    ];
  return [];
}

/**
 * A new upload: what the file holds, where it goes, the unit when the file has no unit column, the date
 * order, and the file. A file uploaded before (same bytes) is refused until the person confirms.
 */
export function UploadForm({ siteId, maxMb, onUploaded }: { siteId: number; maxMb: number; onUploaded: (job: ImportJob) => void }) {
  const [kind, setKind] = useState<ImportKind>('tank_readings');
  const [target, setTarget] = useState('');
  const [unit, setUnit] = useState('');
  const [dateOrder, setDateOrder] = useState<'ymd' | 'dmy' | 'mdy'>('ymd');
  const [file, setFile] = useState<File | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const [duplicate, setDuplicate] = useState<string | null>(null);
  const sources = useQuery(importsQueries.sources(siteId));
  const wards = useQuery(importsQueries.wards(siteId));
  const upload = useUpload(siteId);

  const tanks = (sources.data ?? []).filter((s) => s.type === 'bulk_liquid');
  const stores = (sources.data ?? []).filter((s) => s.type === 'cylinder_store' || s.type === 'emergency_reserve');
  const chosenSource = (sources.data ?? []).find((s) => `s${s.id}` === target) ?? null;
  const units = unitsFor(kind, chosenSource?.calibrationUnit ?? null);
  const tooBig = file !== null && file.size > maxMb * 1024 * 1024;

  const send = async (confirmDuplicate: boolean) => {
    if (!file) {
      setProblem('Choose the CSV file first.');
      return;
    }
    setProblem(null);
    const input: UploadInput = { file, kind, dateOrder, unit: unit || undefined, confirmDuplicate };
    if (target.startsWith('s')) input.sourceId = Number(target.slice(1));
    if (target.startsWith('w')) input.wardId = Number(target.slice(1));
    try {
      const job = await upload.mutateAsync(input);
      setDuplicate(null);
      setFile(null);
      onUploaded(job);
    } catch (e) {
      if (e instanceof ApiError && e.code === 'duplicate_file') setDuplicate(e.message);
      else setProblem(errorMessage(e));
    }
  };

  return (
    <Card>
      <CardHeader
        title="Upload a CSV file"
        description={`Comma or semicolon separated, UTF-8, up to ${maxMb} MB. Nothing is written until you have seen the check and confirmed.`}
      />
      <CardBody>
        <form
          className="flex flex-col gap-4"
          onSubmit={(e) => {
            e.preventDefault();
            void send(false);
          }}
        >
          <fieldset className="flex flex-col gap-2">
            <legend className="mb-1 text-sm font-bold">What the file holds</legend>
            <div className="grid gap-2 sm:grid-cols-2">
              {IMPORT_KINDS.map((k) => (
                <label
                  key={k}
                  htmlFor={`import-kind-${k}`}
                  className={`flex min-h-11 cursor-pointer gap-3 rounded-lg border p-3 ${k === kind ? 'border-primary bg-primary-soft' : 'border-line-strong bg-surface'}`}
                >
                  <input
                    id={`import-kind-${k}`}
                    type="radio"
                    name="kind"
                    value={k}
                    checked={k === kind}
                    onChange={() => {
                      setKind(k);
                      setTarget('');
                      setUnit('');
                    }}
                    className="mt-1 size-5 accent-primary"
                  />
                  <span>
                    <span className="block font-bold">{IMPORT_KIND_LABELS[k]}</span>
                    <span className="block text-sm text-fg-muted">{KIND_HELP[k]}</span>
                  </span>
                </label>
              ))}
            </div>
          </fieldset>
          <div className="grid gap-4 sm:grid-cols-3">
            {kind !== 'historic_usage' && (
              <Field
                label={kind === 'tank_readings' ? 'Tank' : kind === 'store_counts' ? 'Cylinder store' : 'Meter on'}
                hint={kind === 'flow_meter_totals' ? 'The ward (or source) the meter measures.' : 'Or a Tank / Store column in the file.'}
              >
                {(p) => (
                  <Select {...p} value={target} onChange={(e) => setTarget(e.target.value)}>
                    <option value="">{kind === 'flow_meter_totals' ? 'Choose…' : 'From the file'}</option>
                    {kind === 'tank_readings' &&
                      tanks.map((s) => (
                        <option key={s.id} value={`s${s.id}`}>
                          {s.name}
                        </option>
                      ))}
                    {kind === 'store_counts' &&
                      stores.map((s) => (
                        <option key={s.id} value={`s${s.id}`}>
                          {s.name}
                        </option>
                      ))}
                    {kind === 'flow_meter_totals' && (
                      <>
                        <optgroup label="Wards">
                          {(wards.data ?? []).map((w) => (
                            <option key={w.id} value={`w${w.id}`}>
                              {w.name}
                            </option>
                          ))}
                        </optgroup>
                        <optgroup label="Sources">
                          {(sources.data ?? []).map((s) => (
                            <option key={s.id} value={`s${s.id}`}>
                              {s.name}
                            </option>
                          ))}
                        </optgroup>
                      </>
                    )}
                  </Select>
                )}
              </Field>
            )}
            {units.length > 0 && (
              <Field label="Unit" hint="Used where the file has no unit column.">
                {(p) => (
                  <Select {...p} value={unit} onChange={(e) => setUnit(e.target.value)}>
                    <option value="">From the file</option>
                    {units.map((u) => (
                      <option key={u.value} value={u.value}>
                        {u.label}
                      </option>
                    ))}
                  </Select>
                )}
              </Field>
            )}
            <Field label="Dates written as" hint="Times without an offset are the site’s local time.">
              {(p) => (
                <Select {...p} value={dateOrder} onChange={(e) => setDateOrder(e.target.value as 'ymd' | 'dmy' | 'mdy')}>
                  <option value="ymd">2027-01-31</option>
                  <option value="dmy">31/01/2027 (day first)</option>
                  <option value="mdy">01/31/2027 (month first)</option>
                </Select>
              )}
            </Field>
          </div>
          <Field
            label="CSV file"
            hint={file ? `${file.name}, ${formatBytes(file.size)}` : 'Exported from the telemetry portal or a spreadsheet.'}
            error={tooBig ? `This file is ${formatBytes(file!.size)}: above the ${maxMb} MB limit. Split it, e.g. one file per month.` : undefined}
          >
            {(p) => <Input {...p} type="file" accept=".csv,text/csv,text/plain" onChange={(e) => setFile(e.target.files?.[0] ?? null)} className="py-2" />}
          </Field>
          {problem && (
            <Alert tone="critical" role="alert" title="The file was not accepted">
              {problem}
            </Alert>
          )}
          <div className="flex flex-col gap-2 sm:flex-row sm:items-center">
            <Button type="submit" size="lg" busy={upload.isPending} disabled={!file || tooBig}>
              <Icon name="upload" />
              Upload and check
            </Button>
            <a
              href={templateUrl(siteId, kind)}
              download
              className="inline-flex min-h-11 items-center gap-2 rounded-lg px-3 font-bold text-primary underline-offset-4 hover:underline"
            >
              <Icon name="download" />
              Template for {IMPORT_KIND_LABELS[kind].toLowerCase()}
            </a>
          </div>
        </form>
      </CardBody>
      <Dialog
        open={duplicate !== null}
        onClose={() => setDuplicate(null)}
        title="This file was uploaded before"
        footer={
          <div className="flex flex-wrap justify-end gap-2">
            <Button variant="secondary" onClick={() => setDuplicate(null)}>
              Do not upload
            </Button>
            <Button busy={upload.isPending} onClick={() => void send(true)}>
              Upload it again
            </Button>
          </div>
        }
      >
        <p>{duplicate}</p>
        <p className="mt-2 text-fg-muted">Rows already stored for the same tank and time are found in the check, so nothing is counted twice by mistake.</p>
      </Dialog>
    </Card>
  );
}
