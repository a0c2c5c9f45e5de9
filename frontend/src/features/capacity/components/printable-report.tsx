import type { CapacityReport, GasOut, SignoffRow } from '@common/schemas/capacity.schema';
import { formatDateTime, formatDays, formatLitres, formatNumber } from '@/lib/format';
import { COUNT_LABELS, LIMIT_KIND_LABELS, SOURCE_TYPE_LABELS, departmentLabel, formatFlow, formatHours, formatPercent, gasLabel } from '../lib/capacity-format';

/**
 * The capacity check as a document: inputs, method, results, the caution and the engineer's sign-off.
 * On screen it is hidden unless `onScreen`; when printing, only this element is shown (print
 * stylesheet below), so the navigation and buttons stay off the paper.
 */
export function PrintableReport({
  report,
  signoff,
  timeZone,
  onScreen = false,
}: {
  report: CapacityReport;
  signoff: (SignoffRow & { current?: boolean }) | null;
  timeZone: string;
  onScreen?: boolean;
}) {
  const signed = signoff && signoff.current !== false ? signoff : null;
  return (
    <article
      id="capacity-report"
      className={
        onScreen
          ? 'capacity-report mx-auto max-w-5xl rounded-card border border-line bg-surface p-8 text-sm shadow-card'
          : 'capacity-report hidden text-sm print:block'
      }
    >
      <style>{PRINT_CSS}</style>
      <header className="mb-4 border-b-2 border-fg pb-3">
        <p className="text-xs tracking-wider uppercase">Plenum · capacity check</p>
        <h1 className="text-2xl">{report.site.name}</h1>
        <p>
          Computed {formatDateTime(report.generatedAt, timeZone)} · free gas at {report.reference.label} · atmospheric pressure{' '}
          {formatNumber(report.reference.atmosphericBar, 4)} bar · inputs {report.inputsHash.slice(0, 12)}
        </p>
      </header>

      <section className="report-caution mb-4 border-2 border-fg p-3">
        <p className="font-bold">Caution</p>
        <p>{report.caution}</p>
        <p>Oxygen diversity rules marked “from memory, not verified” are editable defaults, not checked against the published table.</p>
      </section>

      <h2 className="mt-4 text-lg">1. Inputs</h2>
      <table className="report-table">
        <tbody>
          <tr>
            <th scope="row">Surge patient flow</th>
            <td>{formatFlow(report.options.flowPerPatientLMin)} each, at full flow (no diversity)</td>
          </tr>
          <tr>
            <th scope="row">Vaporiser derating</th>
            <td>
              {report.options.vaporiserDerating !== undefined
                ? `${report.options.vaporiserDerating} for every vaporiser (what-if)`
                : `each source's own, else ${report.options.vaporiserDeratingDefault} (continuous duty, alternating pair)`}
            </td>
          </tr>
          <tr>
            <th scope="row">Peak hours per day (manifold sizing)</th>
            <td>{formatNumber(report.options.peakHoursPerDay, 1)} h</td>
          </tr>
        </tbody>
      </table>
      {report.gases.map((g) => (
        <InputsOfGas key={g.gasCode} gas={g} />
      ))}

      <h2 className="mt-4 text-lg">2. Method</h2>
      <ol className="ml-5 list-decimal">
        {report.method.map((m) => (
          <li key={m.topic} className="mb-1">
            <strong>{m.topic}.</strong> {m.text} <em>Source: {m.source}</em>
          </li>
        ))}
      </ol>

      <h2 className="mt-4 text-lg">3. Results</h2>
      {report.gases.map((g) => (
        <ResultsOfGas key={g.gasCode} gas={g} flowPerPatientLMin={report.options.flowPerPatientLMin} />
      ))}

      <h2 className="mt-4 text-lg">4. Sign-off</h2>
      <section className="report-signoff grid grid-cols-2 gap-6 border border-fg p-3">
        <div>
          <p className="text-xs uppercase">Engineer</p>
          <p className="min-h-8 border-b border-fg text-base">{signed?.engineerName ?? ''}</p>
        </div>
        <div>
          <p className="text-xs uppercase">Date</p>
          <p className="min-h-8 border-b border-fg text-base">{signed ? formatDateTime(signed.signedAt, timeZone) : ''}</p>
        </div>
        {signed?.note && <p className="col-span-2">Note: {signed.note}</p>}
        <p className="col-span-2 text-xs">
          {signed ? 'Recorded in Plenum with the report as signed.' : 'Not yet signed off in Plenum for these inputs.'} The sign-off supports, and does not
          replace, the site's Authorised Person and the local codes.
        </p>
      </section>
    </article>
  );
}

function InputsOfGas({ gas }: { gas: GasOut }) {
  const runs = gas.zones.flatMap((z) => z.pipeRuns.map((p) => ({ zone: z.name, ...p })));
  return (
    <div className="report-block mt-3">
      <h3 className="font-bold">{gasLabel(gas.gasCode)}</h3>
      <table className="report-table">
        <thead>
          <tr>
            <th>Zone</th>
            <th>Department</th>
            <th className="num">Count</th>
            <th>Source</th>
            <th>Diversity</th>
          </tr>
        </thead>
        <tbody>
          {gas.zones.map((z) => (
            <tr key={z.id}>
              <td>{z.name}</td>
              <td>{departmentLabel(z.department)}</td>
              <td className="num">
                {z.terminalUnits} {COUNT_LABELS[z.countedAs ?? 'terminal_unit'] ?? ''}
              </td>
              <td>{gas.sources.find((s) => s.id === z.sourceId)?.name ?? (z.sourceId ? `source ${z.sourceId}` : '–')}</td>
              <td>{z.diversityMethod === 'binomial' ? `binomial: ${z.formula ?? ''}` : z.ruleSet.name}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {runs.length > 0 && (
        <table className="report-table mt-2">
          <thead>
            <tr>
              <th>Pipe run</th>
              <th>Zone</th>
              <th>Tube, mm</th>
              <th className="num">Length, m</th>
              <th className="num">Fittings</th>
              <th className="num">Line, kPa</th>
              <th className="num">Allowed drop, kPa</th>
            </tr>
          </thead>
          <tbody>
            {runs.map((r) => (
              <tr key={r.id}>
                <td>{r.name}</td>
                <td>{r.zone}</td>
                <td>{r.tube}</td>
                <td className="num">{formatNumber(r.lengthM, 1)}</td>
                <td className="num">{formatNumber(r.fittingsAllowancePercent)} %</td>
                <td className="num">{formatNumber(r.linePressureKPa)}</td>
                <td className="num">{formatNumber(r.allowedDropKPa, 1)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {gas.sources.length > 0 && (
        <table className="report-table mt-2">
          <thead>
            <tr>
              <th>Source</th>
              <th>Type</th>
              <th>Rated limits</th>
              <th>Cylinders</th>
            </tr>
          </thead>
          <tbody>
            {gas.sources.map((s) => (
              <tr key={s.id}>
                <td>{s.name}</td>
                <td>{SOURCE_TYPE_LABELS[s.type] ?? s.type}</td>
                <td>
                  {s.limits.length
                    ? s.limits.map((l) => `${LIMIT_KIND_LABELS[l.kind]} ${formatFlow(l.capacityLMin)}${l.detail ? ` (${l.detail})` : ''}`).join('; ')
                    : (s.missingLimit ?? '–')}
                </td>
                <td>
                  {s.manifold ? `2 banks × ${s.manifold.cylindersPerBank} × ${s.manifold.cylinder} (${formatLitres(s.manifold.cylinderFreeGasL)} each)` : '–'}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </div>
  );
}

function ResultsOfGas({ gas, flowPerPatientLMin }: { gas: GasOut; flowPerPatientLMin: number }) {
  return (
    <div className="report-block mt-3">
      <h3 className="font-bold">
        {gasLabel(gas.gasCode)}: design flow {formatFlow(gas.designFlowLMin)}
        {gas.incomplete ? ' (incomplete: some zones have no documented rule)' : ''}
      </h3>
      <p>{gas.totalNote}</p>
      {gas.limiting ? (
        <p className="report-limiting my-1 border-l-4 border-fg pl-2">
          <strong>Limiting element: {gas.limiting.name}</strong> — {formatFlow(gas.limiting.flowLMin)} of {formatFlow(gas.limiting.capacityLMin)} (
          {formatPercent(gas.limiting.utilisation)}){gas.limiting.ok ? '' : ': EXCEEDED'}. Surge headroom:{' '}
          {gas.headroom.extraPatients === null ? 'not known' : `${gas.headroom.extraPatients} more patients at ${formatNumber(flowPerPatientLMin)} L/min`}.
        </p>
      ) : (
        <p>No capacity limit checked. {gas.headroom.note ?? ''}</p>
      )}
      <table className="report-table">
        <thead>
          <tr>
            <th>Zone</th>
            <th>Formula</th>
            <th className="num">Design flow</th>
            <th>Pipe runs: drop / allowed (carries)</th>
            <th className="num">More patients</th>
            <th>Limited by</th>
          </tr>
        </thead>
        <tbody>
          {gas.zones.map((z) => (
            <tr key={z.id}>
              <td>
                {z.name}
                {z.warning ? ` (${z.warning})` : ''}
              </td>
              <td>{z.refused ?? z.formula}</td>
              <td className="num">{formatFlow(z.designFlowLMin)}</td>
              <td>
                {z.pipeRuns.length === 0
                  ? '–'
                  : z.pipeRuns
                      .map((p) =>
                        p.error
                          ? `${p.name}: ${p.error}`
                          : `${p.name}: ${formatNumber(p.pressureDropKPa, 2)} / ${formatNumber(p.allowedDropKPa, 1)} kPa (${formatFlow(p.capacityLMin)})`,
                      )
                      .join('; ')}
              </td>
              <td className="num">{z.headroom?.extraPatientsWithSource ?? z.headroom?.extraPatients ?? '–'}</td>
              <td>{z.headroom?.limitedBy?.name ?? '–'}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {gas.sources.map((s) => (
        <div key={s.id} className="mt-2">
          <p>
            <strong>{s.name}</strong>: design flow {formatFlow(s.designFlowLMin)}; forecast mean {formatFlow(s.forecastFlowLMin)}.{' '}
            {s.limits.map((l) => `${LIMIT_KIND_LABELS[l.kind]} ${formatPercent(l.utilisation)} used`).join('; ')}
          </p>
          {s.manifold && (
            <p>
              Bank {formatLitres(s.manifold.bankFreeGasL)}: lasts {formatHours(s.manifold.bankDurationAtDesignH)} at design flow,{' '}
              {formatHours(s.manifold.bankDurationAtForecastH)} at forecast flow; changeover every {formatDays(s.manifold.changeoverIntervalDays)};{' '}
              {formatNumber(s.manifold.cylindersPerWeekAtForecast, 1)} cylinders a week. Manifold for the peak:{' '}
              {s.manifold.recommended?.label ?? s.manifold.recommendedNote ?? '–'}.
            </p>
          )}
          {s.reserves.rules.map((r) => (
            <p key={r.rule}>
              {r.rule === 'four_hour_secondary' ? '4-hour rule' : 'Average-day rule'}: needs {formatLitres(r.requiredFreeGasL)}
              {r.cylindersRequired !== null && r.cylinderName ? ` (${r.cylindersRequired} × ${r.cylinderName})` : ''}
              {r.heldFreeGasL !== null ? `; holds ${formatLitres(r.heldFreeGasL)}` : ''} — {r.meets === null ? 'not checked' : r.meets ? 'met' : 'SHORT'}.{' '}
              <em>{r.source}</em>
            </p>
          ))}
          {s.reserves.note && <p>{s.reserves.note}</p>}
        </div>
      ))}
      {gas.ruleSources.length > 0 && (
        <p className="mt-1 text-xs">
          Rule sources: {gas.ruleSources.map((r) => `${r.citation}${r.verified ? '' : ' (from memory, not verified)'}`).join('; ')}
        </p>
      )}
    </div>
  );
}

/** Only the report is printed: everything else on the page is hidden on paper. */
const PRINT_CSS = `
.capacity-report .report-table { width: 100%; border-collapse: collapse; margin-top: 0.25rem; }
.capacity-report .report-table th, .capacity-report .report-table td { border: 1px solid #8c806b; padding: 2px 6px; text-align: left; vertical-align: top; }
.capacity-report .report-table .num { text-align: right; font-variant-numeric: tabular-nums; }
@media print {
  @page { size: A4; margin: 14mm; }
  body * { visibility: hidden; }
  #capacity-report, #capacity-report * { visibility: visible; }
  #capacity-report { display: block !important; position: absolute; left: 0; top: 0; width: 100%; border: 0; box-shadow: none; padding: 0; font-size: 10pt; color: #000; background: #fff; }
  .capacity-report .report-block, .capacity-report .report-signoff { break-inside: avoid; }
}
`;
