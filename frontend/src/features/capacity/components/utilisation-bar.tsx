import { cn } from '@/lib/cn';
import { formatPercent, utilisationTone } from '../lib/capacity-format';

const FILL: Record<string, string> = {
  ok: 'bg-ok',
  watch: 'bg-watch',
  warn: 'bg-warn',
  critical: 'bg-critical',
  neutral: 'bg-line-strong',
  info: 'bg-info',
};

/** How much of a limit the design flow uses: a bar and the percentage in words. */
export function UtilisationBar({ fraction, className, label }: { fraction: number | null; className?: string; label?: string }) {
  const tone = utilisationTone(fraction);
  const width = fraction === null ? 0 : Math.min(100, Math.max(0, fraction * 100));
  return (
    <div className={cn('flex min-w-32 items-center gap-2', className)}>
      <div
        className="h-2.5 flex-1 overflow-hidden rounded-full bg-surface-sunken ring-1 ring-line"
        role="meter"
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={Math.round(width)}
        aria-label={label ?? 'Share of the limit in use at design flow'}
      >
        <div className={cn('h-full rounded-full', FILL[tone])} style={{ width: `${width}%` }} />
      </div>
      <span className={cn('tabular w-14 text-right text-sm font-bold', tone === 'critical' ? 'text-critical' : tone === 'warn' ? 'text-warn' : 'text-fg')}>
        {formatPercent(fraction)}
      </span>
    </div>
  );
}
