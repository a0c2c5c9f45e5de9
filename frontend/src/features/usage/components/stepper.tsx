import { useId } from 'react';
import { cn } from '@/lib/cn';

/**
 * A whole-number count with big minus and plus buttons either side (48 px targets, one thumb), and
 * the number itself typeable. Never below 0 or above `max`.
 */
export function Stepper({
  label,
  value,
  onChange,
  max = 500,
  disabled = false,
  hint,
  className,
}: {
  label: string;
  value: number;
  onChange: (n: number) => void;
  max?: number;
  disabled?: boolean;
  hint?: string;
  className?: string;
}) {
  const id = useId();
  const set = (n: number) => onChange(Math.max(0, Math.min(max, Math.round(Number.isFinite(n) ? n : 0))));
  const btn =
    'flex size-12 shrink-0 items-center justify-center rounded-lg border border-line-strong bg-surface text-2xl font-bold text-primary hover:bg-primary-soft active:bg-primary-soft disabled:cursor-not-allowed disabled:opacity-40';
  return (
    <div className={cn('flex flex-wrap items-center justify-between gap-x-3 gap-y-1', className)}>
      <label htmlFor={id} className="min-w-0 flex-1 text-sm font-bold text-fg">
        {label}
      </label>
      <div className="flex shrink-0 items-center gap-1.5">
        <button type="button" className={btn} onClick={() => set(value - 1)} disabled={disabled || value <= 0} aria-label={`${label}: one fewer`}>
          −
        </button>
        <input
          id={id}
          type="number"
          inputMode="numeric"
          min={0}
          max={max}
          step={1}
          value={value}
          disabled={disabled}
          onChange={(e) => set(e.target.value === '' ? 0 : Number(e.target.value))}
          onFocus={(e) => e.target.select()}
          className="h-12 w-16 rounded-lg border border-line-strong bg-surface text-center text-xl font-bold tabular text-fg disabled:bg-surface-sunken"
          aria-describedby={hint ? `${id}-hint` : undefined}
        />
        <button type="button" className={btn} onClick={() => set(value + 1)} disabled={disabled || value >= max} aria-label={`${label}: one more`}>
          +
        </button>
      </div>
      {hint && (
        <p id={`${id}-hint`} className="w-full text-xs text-fg-muted">
          {hint}
        </p>
      )}
    </div>
  );
}
