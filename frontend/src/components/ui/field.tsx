import { useId, type InputHTMLAttributes, type ReactNode, type SelectHTMLAttributes, type TextareaHTMLAttributes, type Ref } from 'react';
import { cn } from '@/lib/cn';
import { Icon } from './icons';

/**
 * A labelled form field: the label, the control, a hint and the field's error in words. The control
 * receives its id and aria wiring through the render prop, so any input kind fits.
 */
export function Field({
  label,
  hint,
  error,
  className,
  children,
  required,
}: {
  label: ReactNode;
  hint?: ReactNode;
  error?: string;
  className?: string;
  required?: boolean;
  children: (control: { id: string; 'aria-invalid': boolean | undefined; 'aria-describedby': string | undefined }) => ReactNode;
}) {
  const id = useId();
  const hintId = hint ? `${id}-hint` : undefined;
  const errorId = error ? `${id}-error` : undefined;
  const describedBy = [errorId, hintId].filter(Boolean).join(' ') || undefined;
  return (
    <div className={cn('flex flex-col gap-1.5', className)}>
      <label htmlFor={id} className="text-sm font-bold text-fg">
        {label}
        {required && <span className="sr-only"> (required)</span>}
      </label>
      {children({ id, 'aria-invalid': error ? true : undefined, 'aria-describedby': describedBy })}
      {hint && !error && (
        <p id={hintId} className="text-xs text-fg-muted">
          {hint}
        </p>
      )}
      {error && <FieldError id={errorId}>{humaniseMessage(error)}</FieldError>}
    </div>
  );
}

/** zod's built-in messages are for developers; say the same thing for people. */
export function humaniseMessage(message: string): string {
  if (/expected number, received (NaN|undefined|null)|expected number/i.test(message)) return 'enter a number';
  if (/expected string, received (undefined|null)/i.test(message)) return 'required';
  if (/expected int/i.test(message)) return 'enter a whole number';
  if (/^Invalid option/i.test(message)) return 'choose one of the options';
  return message;
}

export function FieldError({ id, children }: { id?: string; children: ReactNode }) {
  return (
    <p id={id} className="flex items-start gap-1.5 text-sm font-bold text-critical">
      <Icon name="alert" className="mt-0.5 size-4" />
      <span>{children}</span>
    </p>
  );
}

const controlBase =
  'w-full min-h-11 rounded-lg border border-line-strong bg-surface px-3 text-base text-fg placeholder:text-sand-500 aria-invalid:border-critical aria-invalid:ring-1 aria-invalid:ring-critical disabled:bg-surface-sunken disabled:text-fg-muted';

export function Input({ className, ref, ...rest }: InputHTMLAttributes<HTMLInputElement> & { ref?: Ref<HTMLInputElement> }) {
  return <input ref={ref} className={cn(controlBase, className)} {...rest} />;
}

export function Select({ className, ref, children, ...rest }: SelectHTMLAttributes<HTMLSelectElement> & { ref?: Ref<HTMLSelectElement> }) {
  return (
    <select ref={ref} className={cn(controlBase, 'pr-8', className)} {...rest}>
      {children}
    </select>
  );
}

export function Textarea({ className, ref, ...rest }: TextareaHTMLAttributes<HTMLTextAreaElement> & { ref?: Ref<HTMLTextAreaElement> }) {
  return <textarea ref={ref} className={cn(controlBase, 'py-2', className)} {...rest} />;
}

/** An input with a unit shown after it ("bar", "L/min"). */
export function UnitInput({ unit, className, ...rest }: InputHTMLAttributes<HTMLInputElement> & { unit: string; ref?: Ref<HTMLInputElement> }) {
  return (
    <div className={cn('flex items-stretch', className)}>
      <Input className="rounded-r-none tabular" {...rest} />
      <span className="inline-flex min-w-14 items-center justify-center rounded-r-lg border border-l-0 border-line-strong bg-surface-sunken px-3 text-sm font-bold text-fg-muted">
        {unit}
      </span>
    </div>
  );
}

export function Checkbox({ label, className, ref, ...rest }: InputHTMLAttributes<HTMLInputElement> & { label: ReactNode; ref?: Ref<HTMLInputElement> }) {
  return (
    <label className={cn('inline-flex min-h-11 cursor-pointer items-center gap-3 text-base', className)}>
      <input ref={ref} type="checkbox" className="size-5 accent-primary" {...rest} />
      <span>{label}</span>
    </label>
  );
}
