import { lazy, Suspense, useDeferredValue, useMemo, type ReactNode } from 'react';
import { useForm, useWatch, type UseFormRegisterReturn } from 'react-hook-form';
import { DateTime } from 'luxon';
import { isLiquefiedGas } from '@common/gas/gases';
import { BAR_PER_PSI, celsiusToFahrenheit, litresToCubicFeet } from '@common/gas/units';
import { cn } from '@/lib/cn';
import { formatDurationMinutes, formatKg, formatLitres, formatNumber, formatSignificant } from '@/lib/format';
import { Alert } from '@/components/ui/alert';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Field, Select, UnitInput } from '@/components/ui/field';
import { GasSwatch, coloursFor } from '@/components/ui/gas-swatch';
import {
  defaultTemperature,
  evaluateCylinderCheck,
  KG_PER_LB,
  gasLabel,
  referenceLabel,
  referenceTemperatureC,
  referenceTemperatureLabel,
  temperatureCautions,
  type CheckField,
  type CheckSite,
  type CheckValues,
  type CompressedCheck,
  type LiquefiedCheck,
} from '../lib/evaluate-cylinder-check';
import { LoadingState } from '@/components/ui/states';

// the chart library is large: the time remaining shows at once and the chart follows
const ContentsChart = lazy(() => import('./contents-chart').then((m) => ({ default: m.ContentsChart })));

/** What the check needs of a cylinder type and a gas (the app passes the catalogue in). */
export interface CylinderTypeOption {
  id: number;
  name: string;
  gasCode: string;
  waterCapacityL: number;
  fillPressureBar: number;
  tareKg: number | null;
  active: boolean;
}
export interface GasOption {
  code: string;
  name: string;
  iso32Colours: string[];
  cgaColours: string[];
}
export interface CheckSiteInfo extends CheckSite {
  name: string;
  cylinderColours: string;
}

export const PLANNING_AID =
  'Planning aid only: it supports and does not replace local practice, the supplier’s instructions and your site’s authorised person.';

type FormValues = CheckValues & { cylinderTypeId: string };
const FLOW_PRESETS = [1, 2, 4, 6, 10, 15];

export function CylinderCheck({ site, cylinderTypes, gases }: { site: CheckSiteInfo; cylinderTypes: CylinderTypeOption[]; gases: GasOption[] }) {
  const us = site.unitSystem === 'us';
  const pUnit = us ? 'psi' : 'bar';
  const tUnit = us ? '°F' : '°C';
  const mUnit = us ? 'lb' : 'kg';
  const activeTypes = useMemo(() => cylinderTypes.filter((t) => t.active), [cylinderTypes]);
  const gasName = (code: string) => gases.find((g) => g.code === code)?.name ?? code;

  const { register, setValue, control } = useForm<FormValues>({
    defaultValues: {
      cylinderTypeId: '',
      gasCode: 'O2',
      waterCapacityL: '',
      gauge: '',
      temperature: defaultTemperature(site),
      flowLMin: '',
      reserve: '',
      gross: '',
      tare: '',
    },
  });
  const values = useWatch({ control }) as FormValues;
  const deferred = useDeferredValue(values);
  const outcome = useMemo(() => evaluateCylinderCheck(deferred, site), [deferred, site]);
  const selectedType = activeTypes.find((t) => String(t.id) === values.cylinderTypeId) ?? null;
  const liquefied = isLiquefiedGas(values.gasCode);
  const errors: Partial<Record<CheckField, string>> = outcome.ok ? {} : outcome.errors;
  const gas = gases.find((g) => g.code === values.gasCode);
  // shown at the temperature field itself, where a cold reading is typed
  const temperatureWarnings = temperatureCautions(values.gasCode, values.temperature, site);

  const typeField = register('cylinderTypeId', {
    onChange: (e) => {
      const t = activeTypes.find((x) => String(x.id) === e.target.value);
      if (!t) return;
      setValue('gasCode', t.gasCode);
      setValue('waterCapacityL', String(t.waterCapacityL));
      if (t.tareKg) setValue('tare', String(us ? round(t.tareKg / KG_PER_LB, 1) : t.tareKg));
    },
  });
  const gasField = register('gasCode', {
    onChange: (e) => {
      // a type belongs to one gas: choosing another gas means typing the capacity
      if (selectedType && selectedType.gasCode !== e.target.value) setValue('cylinderTypeId', '');
    },
  });

  const byGas = useMemo(() => {
    const map = new Map<string, CylinderTypeOption[]>();
    for (const t of activeTypes) map.set(t.gasCode, [...(map.get(t.gasCode) ?? []), t]);
    return [...map.entries()];
  }, [activeTypes]);

  return (
    <div className={cn('grid gap-5 lg:grid-cols-[minmax(0,26rem)_minmax(0,1fr)] lg:items-start', outcome.ok && 'pb-24 lg:pb-0')}>
      <form className="flex flex-col gap-5" onSubmit={(e) => e.preventDefault()} noValidate aria-label="Cylinder check inputs">
        <Card>
          <CardHeader title="Cylinder" />
          <CardBody className="flex flex-col gap-4">
            <Field label="Cylinder type" hint={activeTypes.length === 0 ? 'No cylinder types in the catalogue yet: enter the water capacity.' : undefined}>
              {(c) => (
                <Select {...c} {...typeField}>
                  <option value="">Other: enter the water capacity</option>
                  {byGas.map(([code, list]) => (
                    <optgroup key={code} label={gasName(code)}>
                      {list.map((t) => (
                        <option key={t.id} value={t.id}>
                          {gasName(t.gasCode)} · {t.name}
                        </option>
                      ))}
                    </optgroup>
                  ))}
                </Select>
              )}
            </Field>
            <Field label="Gas" error={errors.gasCode}>
              {(c) => (
                <div className="flex items-center gap-3">
                  <Select {...c} {...gasField} className="flex-1">
                    {gases.map((g) => (
                      <option key={g.code} value={g.code}>
                        {g.name}
                      </option>
                    ))}
                  </Select>
                  {gas && <GasSwatch colours={coloursFor(gas, site.cylinderColours)} label={gas.name} showLabel={false} />}
                </div>
              )}
            </Field>
            <Field
              label="Water capacity"
              error={errors.waterCapacityL}
              hint={selectedType ? `From the cylinder type (${selectedType.name}).` : 'Stamped on the cylinder shoulder.'}
            >
              {(c) => (
                <UnitInput
                  {...c}
                  {...register('waterCapacityL')}
                  unit="L"
                  inputMode="decimal"
                  readOnly={!!selectedType}
                  className={cn(selectedType && '[&_input]:bg-surface-sunken')}
                />
              )}
            </Field>
          </CardBody>
        </Card>

        <Card>
          <CardHeader title={liquefied ? 'Weighing' : 'Reading'} />
          <CardBody className="flex flex-col gap-4">
            {liquefied ? (
              <>
                <Alert tone="info" title="Weigh it: the gauge does not show the contents">
                  While liquid remains, the gauge shows only the vapour pressure, which stays the same until the cylinder is nearly empty. Only the weight tells
                  how much is left.
                </Alert>
                <div className="grid grid-cols-2 gap-3">
                  <NumberField label="Gross weight" unit={mUnit} error={errors.gross} reg={register('gross')} />
                  <NumberField label="Tare weight" unit={mUnit} error={errors.tare} reg={register('tare')} hint="Stamped on the cylinder." />
                </div>
              </>
            ) : (
              <NumberField label="Gauge reading" unit={pUnit} error={errors.gauge} reg={register('gauge')} large />
            )}
            <NumberField
              label="Gas temperature"
              unit={tUnit}
              error={errors.temperature}
              reg={register('temperature')}
              hint={`The store is usually ${defaultTemperature(site)} ${tUnit}. A cylinder brought in from the cold takes hours to warm.`}
            />
            {temperatureWarnings.map((c) => (
              <Alert
                key={c}
                tone={/hypoxic/i.test(c) && /condense/i.test(c) ? 'critical' : 'warn'}
                title={/condense/i.test(c) ? 'The mixture may have separated' : 'Storage temperature'}
                role="alert"
              >
                {c}
              </Alert>
            ))}
          </CardBody>
        </Card>

        <Card>
          <CardHeader title="Use" />
          <CardBody className="flex flex-col gap-4">
            <NumberField label="Flow" unit="L/min" error={errors.flowLMin} reg={register('flowLMin')} large />
            <div className="flex flex-wrap gap-2" role="group" aria-label="Common flows">
              {FLOW_PRESETS.map((f) => (
                <button
                  key={f}
                  type="button"
                  aria-pressed={values.flowLMin === String(f)}
                  onClick={() => setValue('flowLMin', String(f), { shouldDirty: true })}
                  className={cn(
                    'min-h-11 min-w-14 rounded-lg border px-3 font-bold',
                    values.flowLMin === String(f)
                      ? 'border-primary bg-primary text-primary-fg'
                      : 'border-line-strong bg-surface text-primary hover:bg-primary-soft',
                  )}
                >
                  {f}
                  <span className="sr-only"> litres per minute</span>
                </button>
              ))}
            </div>
            {!liquefied && (
              <NumberField
                label="Change the cylinder at"
                unit={pUnit}
                error={errors.reserve}
                reg={register('reserve')}
                hint="The reserve your local practice keeps (gauge). Blank: 200 psi (13.8 bar), the residual US EMS guidance keeps; 0 runs the time to empty."
              />
            )}
          </CardBody>
        </Card>
      </form>

      <section aria-labelledby="check-results" className="flex flex-col gap-5">
        <h2 id="check-results" className="sr-only">
          Result
        </h2>
        <Alert tone="watch" title={PLANNING_AID} />
        {outcome.ok ? (
          <Results r={outcome.result} fillPressureBar={selectedType?.fillPressureBar ?? null} shownAbove={temperatureWarnings} />
        ) : (
          <Card>
            <CardBody>
              {outcome.general ? (
                <Alert tone="critical" title="This cannot be computed" role="alert">
                  {outcome.general}
                </Alert>
              ) : Object.keys(outcome.errors).length > 0 ? (
                <p className="text-fg-muted">Correct the marked fields to see the time remaining.</p>
              ) : (
                <p className="text-lg text-fg-muted">
                  {liquefied ? 'Enter the gross and tare weights and the flow' : 'Enter the gauge reading and the flow'} to see the time remaining.
                </p>
              )}
            </CardBody>
          </Card>
        )}
      </section>
      {outcome.ok && <StickyTime r={outcome.result} />}
    </div>
  );
}

function NumberField({
  label,
  unit,
  error,
  reg,
  hint,
  large = false,
}: {
  label: string;
  unit: string;
  error?: string;
  reg: UseFormRegisterReturn;
  hint?: ReactNode;
  large?: boolean;
}) {
  return (
    <Field label={label} error={error} hint={hint}>
      {(c) => (
        <UnitInput
          {...c}
          {...reg}
          unit={unit}
          inputMode="decimal"
          autoComplete="off"
          className={cn(large && '[&_input]:min-h-14 [&_input]:text-2xl [&_input]:font-bold')}
        />
      )}
    </Field>
  );
}

function round(n: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(n * f) / f;
}

function untilClock(minutes: number): string | null {
  if (!Number.isFinite(minutes) || minutes <= 0 || minutes > 7 * 1440) return null;
  const at = DateTime.now().plus({ minutes });
  const sameDay = at.hasSame(DateTime.now(), 'day');
  return at.toFormat(sameDay ? 'HH:mm' : 'ccc HH:mm');
}

function volume(l: number, us: boolean): string {
  return us ? `${formatLitres(l)} (${formatNumber(litresToCubicFeet(l), 1)} ft³)` : formatLitres(l);
}

function StickyTime({ r }: { r: CompressedCheck | LiquefiedCheck }) {
  return (
    <div
      className="fixed inset-x-0 bottom-0 z-30 border-t-2 border-primary bg-surface px-4 py-2 shadow-[0_-4px_12px_rgb(0_0_0/0.08)] lg:hidden"
      aria-hidden="true"
    >
      <p className="text-xs font-bold text-fg-muted uppercase">Time remaining at {formatNumber(r.flowLMin, 1)} L/min</p>
      <p className="text-3xl font-black tabular">{formatDurationMinutes(r.minutes)}</p>
    </div>
  );
}

function Results({ r, fillPressureBar, shownAbove }: { r: CompressedCheck | LiquefiedCheck; fillPressureBar: number | null; shownAbove: string[] }) {
  const cautions = r.cautions.filter((c) => !shownAbove.includes(c));
  const u = r.units;
  const clock = untilClock(r.minutes);
  const refT = referenceTemperatureLabel(u);
  const pressure = (bar: number) => `${formatNumber(u.us ? bar / BAR_PER_PSI : bar, u.us ? 0 : 1)} ${u.pressure}`;
  const noGas = r.minutes <= 0;
  return (
    <>
      <Card className={cn('border-2', noGas ? 'border-critical' : 'border-primary')}>
        <CardBody>
          <p className="text-sm font-bold text-fg-muted uppercase">Time remaining</p>
          <p className={cn('text-4xl font-black tabular sm:text-5xl', noGas && 'text-critical')} aria-live="polite">
            {noGas ? 'No usable gas' : formatDurationMinutes(r.minutes)}
          </p>
          <p className="mt-1 text-fg-muted">
            at {formatNumber(r.flowLMin, 1)} L/min
            {r.kind === 'compressed'
              ? r.reserveBar > 0
                ? `, until the gauge reads ${pressure(r.reserveBar)}${r.reserveBasis ? ` (default: ${r.reserveBasis})` : ''}`
                : ', until empty'
              : ', until the cylinder is empty'}
            {clock && !noGas && (
              <>
                {' '}
                · about <strong className="text-fg">{clock}</strong> if the flow stays the same
              </>
            )}
          </p>
          <p className="mt-2 text-sm">Usable: {volume(r.usableFreeGasL, u.us)} free gas.</p>
          {r.kind === 'compressed' && r.minutesRange && !noGas && (
            <p className="mt-1 text-sm text-warn">
              Mixture estimate: between {formatDurationMinutes(r.minutesRange.low)} and {formatDurationMinutes(r.minutesRange.high)} ({r.minutesRange.method}).
            </p>
          )}
        </CardBody>
      </Card>

      {cautions.length > 0 && (
        <div className="flex flex-col gap-2">
          {cautions.map((c) => (
            <Alert key={c} tone={/hypoxic|overfill|liquid-full|separat|condense/i.test(c) ? 'critical' : 'warn'} title="Caution" role="alert">
              {c}
            </Alert>
          ))}
        </div>
      )}

      {r.kind === 'compressed' ? (
        <CompressedDetails r={r} fillPressureBar={fillPressureBar} refT={refT} pressure={pressure} />
      ) : (
        <LiquefiedDetails r={r} pressure={pressure} />
      )}

      {r.kind === 'compressed' && (
        <Card>
          <CardBody>
            <Suspense fallback={<LoadingState label="Loading the chart…" />}>
              <ContentsChart
                points={r.chart}
                reading={u.us ? r.contents.gaugeBar / BAR_PER_PSI : r.contents.gaugeBar}
                realNow={r.contents.freeGasL}
                pressureUnit={u.pressure}
                temperatureLabel={`${formatNumber(u.us ? celsiusToFahrenheit(r.temperatureC) : r.temperatureC, 1)} ${u.temperature}`}
              />
            </Suspense>
          </CardBody>
        </Card>
      )}

      <Card>
        <CardHeader title="Inputs and method" headingLevel={3} />
        <CardBody className="text-sm">
          <ul className="flex flex-col gap-1">
            <li>Gas: {gasLabel(r.gas)}</li>
            <li>Water capacity: {formatNumber(r.waterCapacityL, 1)} L</li>
            {r.kind === 'compressed' ? (
              <li>
                Gauge: {pressure(r.contents.gaugeBar)} ({formatNumber(r.contents.pressureBarAbs, 2)} bar absolute)
              </li>
            ) : (
              <li>Contents by weight: {formatKg(r.contents.massKg)}</li>
            )}
            <li>
              Gas temperature: {formatNumber(r.temperatureC, 1)} °C{u.us && ` (${formatNumber(celsiusToFahrenheit(r.temperatureC), 0)} °F)`}
            </li>
            <li>
              Flow: {formatNumber(r.flowLMin, 1)} L/min{r.kind === 'compressed' && `; reserve ${pressure(r.reserveBar)}`}
            </li>
            <li>Atmospheric pressure at the site: {formatNumber(u.atmosphericBar, 4)} bar</li>
            <li>Free gas stated at {referenceLabel(u.reference)}</li>
          </ul>
          <p className="mt-3 rounded-lg bg-surface-sunken px-3 py-2 font-mono text-xs">
            {r.kind === 'compressed' ? `real gas: ${r.method}; ideal: pV = nRT` : `contents: ${r.method}`}
          </p>
        </CardBody>
      </Card>
    </>
  );
}

function Stat({ label, value, note }: { label: string; value: ReactNode; note?: ReactNode }) {
  return (
    <div className="rounded-lg bg-surface-sunken px-3 py-2">
      <dt className="text-sm text-fg-muted">{label}</dt>
      <dd className="text-xl font-bold tabular">{value}</dd>
      {note && <dd className="text-xs text-fg-muted">{note}</dd>}
    </div>
  );
}

function CompressedDetails({
  r,
  fillPressureBar,
  refT,
  pressure,
}: {
  r: CompressedCheck;
  fillPressureBar: number | null;
  refT: string;
  pressure: (bar: number) => string;
}) {
  const c = r.contents;
  const diff = c.idealFreeGasL > 0 ? ((c.freeGasL - c.idealFreeGasL) / c.idealFreeGasL) * 100 : 0;
  const eqBar = r.units.us ? r.equivalentGauge * BAR_PER_PSI : r.equivalentGauge;
  const share = fillPressureBar ? (eqBar / fillPressureBar) * 100 : null;
  const tempDiffers = Math.abs(r.temperatureC - referenceTemperatureC(r.units)) > 0.5;
  return (
    <Card>
      <CardHeader title="Contents" headingLevel={3} />
      <CardBody className="flex flex-col gap-4">
        <dl className="grid gap-2 sm:grid-cols-2">
          <Stat label="Free gas (real gas)" value={volume(c.freeGasL, r.units.us)} note="down to atmospheric pressure" />
          <Stat
            label="Ideal gas (pV = nRT)"
            value={volume(c.idealFreeGasL, r.units.us)}
            note={c.freeGasL > 0 ? `real gas is ${diff >= 0 ? '+' : ''}${formatNumber(diff, 1)} % on this` : undefined}
          />
          <Stat label="Compressibility Z" value={formatSignificant(c.Z, 4)} note="Z = pV/(nRT); 1 for an ideal gas" />
          <Stat label="Gas mass" value={formatKg(c.massKg)} />
        </dl>
        <div className="rounded-lg border border-line px-3 py-2">
          <p className="text-sm text-fg-muted">Same contents at {refT}</p>
          <p className="text-xl font-bold tabular">{pressure(eqBar)}</p>
          <p className="text-sm">
            {tempDiffers ? (
              <>
                A cylinder reads lower when cold and higher when warm, with the same gas inside.
                {share !== null && fillPressureBar !== null && (
                  <>
                    {' '}
                    This is {formatNumber(share)} % of the {pressure(fillPressureBar)} fill.
                  </>
                )}
              </>
            ) : (
              'The gas is at the reference temperature: the reading needs no correction.'
            )}
          </p>
        </div>
      </CardBody>
    </Card>
  );
}

function LiquefiedDetails({ r, pressure }: { r: LiquefiedCheck; pressure: (bar: number) => string }) {
  const c = r.contents;
  return (
    <Card>
      <CardHeader title="Contents" headingLevel={3} />
      <CardBody>
        <dl className="grid gap-2 sm:grid-cols-2">
          <Stat label="Gas mass" value={formatKg(c.massKg)} note={r.units.us ? `${formatNumber(c.massKg / KG_PER_LB, 1)} lb` : undefined} />
          <Stat label="Free gas (real gas)" value={volume(c.freeGasL, r.units.us)} />
          <Stat
            label="Liquid left"
            value={c.liquidPresent ? `yes, ${formatNumber(c.liquidVolumeFraction * 100)} % of the volume` : 'no'}
            note={c.liquidPresent ? 'the gauge stays at the vapour pressure' : 'the pressure now falls as gas is drawn'}
          />
          <Stat label="Filling ratio" value={`${formatNumber(c.fillingRatioKgPerL, 3)} kg/L`} />
          {c.pressureBarAbs !== null && (
            <Stat
              label="Expected gauge"
              value={pressure(c.pressureBarAbs - r.units.atmosphericBar)}
              note={c.liquidPresent ? 'vapour pressure: it says nothing about the contents' : undefined}
            />
          )}
        </dl>
      </CardBody>
    </Card>
  );
}
