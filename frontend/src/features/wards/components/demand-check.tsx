import { useState } from 'react';
import { Link } from 'react-router-dom';
import { formatLitres, formatNumber } from '@/lib/format';
import { toast } from '@/lib/toast';
import { Button } from '@/components/ui/button';
import { Card, CardHeader } from '@/components/ui/card';
import { EmptyState } from '@/components/ui/states';
import { useAcceptCorrection, type GasDemand, type SourceOption, type WardDetail } from '../api/wards-api';
import { gasName } from '../lib/ward-labels';

/** How far a factor is from 1, in words: within 10 % the model is doing its job. */
function judge(factor: number): { text: string; tone: string } {
  const off = Math.abs(factor - 1);
  if (off <= 0.1) return { text: 'The model matches the measured use well.', tone: 'text-ok' };
  if (off <= 0.3) return { text: factor > 1 ? 'The ward uses more than modelled.' : 'The ward uses less than modelled.', tone: 'text-watch' };
  return {
    text:
      factor > 1
        ? 'The ward uses much more than modelled: check the therapy lines before accepting.'
        : 'The ward uses much less than modelled: check the therapy lines before accepting.',
    tone: 'text-warn',
  };
}

/**
 * Modelled against measured use per gas, and the correction factor that would make the model meet the
 * measurement. Accepting it makes the forecast of the primary source use modelled demand × the factor.
 */
export function DemandCheck({
  detail,
  sources,
  canAccept,
  onSaved,
}: {
  detail: WardDetail;
  sources: SourceOption[];
  canAccept: boolean;
  onSaved?: () => void;
}) {
  return (
    <Card>
      <CardHeader
        title="Modelled and measured use"
        description="Measured use is the ward’s share of its primary source’s measured use (by modelled share), from recent readings."
      />
      {detail.perGas.length === 0 ? (
        <EmptyState title="No demand yet" className="py-6">
          Add therapy lines and a primary feed to see the ward’s use.
        </EmptyState>
      ) : (
        <ul className="divide-y divide-line">
          {detail.perGas.map((g) => (
            <GasRow key={g.gasCode} g={g} source={sources.find((s) => s.id === g.primarySource?.id)} canAccept={canAccept} onSaved={onSaved} />
          ))}
        </ul>
      )}
    </Card>
  );
}

function GasRow({ g, source, canAccept, onSaved }: { g: GasDemand; source?: SourceOption; canAccept: boolean; onSaved?: () => void }) {
  const accept = useAcceptCorrection(onSaved);
  const [confirm, setConfirm] = useState(false);
  const factor = g.suggestedFactor;
  const verdict = factor !== null ? judge(factor) : null;
  const rounded = factor !== null ? Math.round(factor * 1000) / 1000 : null;
  const inUse = source?.forecastBasis === 'scaled' ? (source.modelCorrectionFactor ?? 1) : null;
  const alreadyAccepted = inUse !== null && rounded !== null && Math.abs(inUse - rounded) < 0.005;
  return (
    <li className="flex flex-col gap-2 px-4 py-3 sm:px-5">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <p className="text-lg font-bold">{gasName(g.gasCode)}</p>
        {g.primarySource ? (
          <Link to={`/sources/${g.primarySource.id}`} className="text-sm text-primary underline-offset-2 hover:underline">
            Primary source: {g.primarySource.name}
          </Link>
        ) : (
          <span className="text-sm text-warn">No primary source: this demand is not forecast.</span>
        )}
      </div>
      <dl className="grid grid-cols-3 gap-3 text-sm">
        <div>
          <dt className="text-fg-muted">Modelled</dt>
          <dd className="font-bold tabular">{formatLitres(g.modelledLPerDay)}/day</dd>
        </div>
        <div>
          <dt className="text-fg-muted">Measured</dt>
          <dd className="font-bold tabular">{g.measuredLPerDay === null ? 'Not measured' : `${formatLitres(g.measuredLPerDay)}/day`}</dd>
        </div>
        <div>
          <dt className="text-fg-muted">Suggested factor</dt>
          <dd className="font-bold tabular">{factor === null ? '–' : `× ${formatNumber(factor, 2)}`}</dd>
        </div>
      </dl>
      {verdict && <p className={`text-sm font-bold ${verdict.tone}`}>{verdict.text}</p>}
      {source && (
        <p className="text-sm text-fg-muted">
          {inUse !== null
            ? `The source’s forecast now uses modelled demand × ${formatNumber(inUse, 2)}.`
            : source.forecastBasis === 'measured'
              ? 'The source’s forecast uses its measured use directly.'
              : 'The source’s forecast uses the model as it is.'}
        </p>
      )}
      {g.measuredLPerDay === null && (
        <p className="text-sm text-fg-muted">Measured use needs two days or more of readings of a bulk tank that feeds this ward as primary.</p>
      )}
      {canAccept && rounded !== null && g.primarySource && !alreadyAccepted && (
        <div className="flex flex-wrap items-center gap-2">
          {confirm ? (
            <>
              <span className="text-sm">
                Forecast {g.primarySource.name} with modelled demand × {formatNumber(rounded, 2)}? It applies to every ward this source feeds, and is recorded
                in the audit log.
              </span>
              <Button
                size="sm"
                busy={accept.isPending}
                onClick={() =>
                  accept.mutate(
                    { sourceId: g.primarySource!.id, factor: rounded },
                    {
                      onSuccess: () => {
                        toast.ok(`${g.primarySource!.name} now forecasts with modelled demand × ${formatNumber(rounded, 2)}.`);
                        setConfirm(false);
                      },
                    },
                  )
                }
              >
                Accept × {formatNumber(rounded, 2)}
              </Button>
              <Button variant="secondary" size="sm" onClick={() => setConfirm(false)}>
                Not now
              </Button>
            </>
          ) : (
            <Button variant="secondary" size="sm" onClick={() => setConfirm(true)}>
              Accept correction…
            </Button>
          )}
        </div>
      )}
    </li>
  );
}
