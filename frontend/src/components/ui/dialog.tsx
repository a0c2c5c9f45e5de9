import { useEffect, useId, useRef, type ReactNode } from 'react';
import { cn } from '@/lib/cn';
import { Icon } from './icons';
import { buttonClasses } from './button';

/**
 * A modal on the native <dialog> (focus stays inside, Escape closes). Full screen on phones, a centred
 * panel on wider screens.
 */
export function Dialog({
  open,
  onClose,
  title,
  description,
  children,
  footer,
  wide = false,
}: {
  open: boolean;
  onClose: () => void;
  title: ReactNode;
  description?: ReactNode;
  children: ReactNode;
  footer?: ReactNode;
  wide?: boolean;
}) {
  const ref = useRef<HTMLDialogElement>(null);
  const titleId = useId();
  useEffect(() => {
    const d = ref.current;
    if (!d) return;
    if (open && !d.open) d.showModal();
    if (!open && d.open) d.close();
  }, [open]);
  return (
    <dialog
      ref={ref}
      aria-labelledby={titleId}
      onCancel={(e) => {
        e.preventDefault();
        onClose();
      }}
      className={cn(
        'm-0 h-full max-h-none w-full max-w-none bg-surface p-0 text-fg backdrop:bg-ink-950/50 sm:m-auto sm:h-fit sm:max-h-[90vh] sm:rounded-card sm:border sm:border-line sm:shadow-xl',
        wide ? 'sm:w-[min(56rem,94vw)]' : 'sm:w-[min(36rem,94vw)]',
      )}
    >
      {open && (
        <div className="flex h-full max-h-[inherit] flex-col">
          <div className="flex items-start justify-between gap-3 border-b border-line px-4 py-3 sm:px-5">
            <div>
              <h2 id={titleId} className="text-xl">
                {title}
              </h2>
              {description && <p className="text-sm text-fg-muted">{description}</p>}
            </div>
            <button
              type="button"
              onClick={onClose}
              aria-label="Close"
              className="-mr-2 inline-flex size-11 items-center justify-center rounded-lg text-fg-muted hover:bg-primary-soft hover:text-fg"
            >
              <Icon name="close" />
            </button>
          </div>
          <div className="flex-1 overflow-y-auto px-4 py-4 sm:px-5">{children}</div>
          {footer && <div className="flex flex-wrap justify-end gap-2 border-t border-line px-4 py-3 sm:px-5">{footer}</div>}
        </div>
      )}
    </dialog>
  );
}

/** The buttons at the foot of a form in a dialog: cancel and the submit, busy while saving. */
export function FormActions({ onCancel, busy, submitLabel = 'Save' }: { onCancel: () => void; busy?: boolean; submitLabel?: string }) {
  return (
    <div className="sticky -bottom-4 -mx-4 -mb-4 mt-2 flex flex-wrap justify-end gap-2 border-t border-line bg-surface px-4 py-3 sm:-mx-5 sm:px-5">
      <button type="button" onClick={onCancel} className={buttonClasses({ variant: 'secondary' })}>
        Cancel
      </button>
      <button type="submit" disabled={busy} aria-busy={busy || undefined} className={buttonClasses({ variant: 'primary' })}>
        {submitLabel}
      </button>
    </div>
  );
}
