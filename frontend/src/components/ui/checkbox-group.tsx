import type { ReactNode } from 'react';
import { cn } from '@/lib/cn';
import { FieldError, humaniseMessage } from './field';

/** A set of checkboxes that edits one array value (roles, granted sites). */
export function CheckboxGroup<V extends string | number>({
  legend,
  options,
  value,
  onChange,
  error,
  hint,
  className,
}: {
  legend: ReactNode;
  options: { value: V; label: ReactNode }[];
  value: V[];
  onChange: (next: V[]) => void;
  error?: string;
  hint?: ReactNode;
  className?: string;
}) {
  return (
    <fieldset className={cn('flex flex-col gap-1', className)} aria-invalid={error ? true : undefined}>
      <legend className="pb-1 text-sm font-bold">{legend}</legend>
      {hint && <p className="text-xs text-fg-muted">{hint}</p>}
      <div className="flex flex-col sm:grid sm:grid-cols-2 sm:gap-x-4">
        {options.map((o) => (
          <label key={String(o.value)} className="inline-flex min-h-11 cursor-pointer items-center gap-3">
            <input
              type="checkbox"
              className="size-5 accent-primary"
              checked={value.includes(o.value)}
              onChange={(e) => onChange(e.target.checked ? [...value, o.value] : value.filter((v) => v !== o.value))}
            />
            <span>{o.label}</span>
          </label>
        ))}
      </div>
      {error && <FieldError>{humaniseMessage(error)}</FieldError>}
    </fieldset>
  );
}
