import { cn } from '@/lib/cn';
import { WEEKDAYS } from '@/lib/schedule-format';

const HOURS = Array.from({ length: 24 }, (_, h) => h);

/**
 * Toggles for the clock hours or weekdays a therapy line runs. `null` means all of them; the last one
 * cannot be switched off, since an empty list would also mean "all" to the demand model.
 */
export function ChipPicker({
  legend,
  options,
  value,
  onChange,
  total,
}: {
  legend: string;
  options: { value: number; label: string }[];
  value: number[] | null;
  onChange: (next: number[] | null) => void;
  total: number;
}) {
  const on = new Set(value && value.length ? value : options.map((o) => o.value));
  const toggle = (v: number) => {
    const next = new Set(on);
    if (next.has(v)) {
      if (next.size === 1) return;
      next.delete(v);
    } else next.add(v);
    onChange(next.size >= total ? null : [...next].sort((a, b) => a - b));
  };
  return (
    <fieldset>
      <legend className="pb-1 text-sm font-bold">{legend}</legend>
      <div className="flex flex-wrap gap-1.5">
        {options.map((o) => {
          const pressed = on.has(o.value);
          return (
            <button
              key={o.value}
              type="button"
              aria-pressed={pressed}
              onClick={() => toggle(o.value)}
              className={cn(
                'inline-flex min-h-11 min-w-11 items-center justify-center rounded-lg border px-2 text-sm font-bold tabular sm:min-h-9 sm:min-w-10',
                pressed ? 'border-primary bg-primary text-primary-fg' : 'border-line-strong bg-surface text-fg-muted hover:bg-primary-soft',
              )}
            >
              {o.label}
            </button>
          );
        })}
      </div>
    </fieldset>
  );
}

export function HoursPicker({ value, onChange }: { value: number[] | null; onChange: (next: number[] | null) => void }) {
  return (
    <ChipPicker
      legend="Hours (local clock; each chip is the hour starting then)"
      options={HOURS.map((h) => ({ value: h, label: String(h).padStart(2, '0') }))}
      value={value}
      onChange={onChange}
      total={24}
    />
  );
}

export function WeekdaysPicker({ value, onChange }: { value: number[] | null; onChange: (next: number[] | null) => void }) {
  return <ChipPicker legend="Days" options={WEEKDAYS} value={value} onChange={onChange} total={7} />;
}
