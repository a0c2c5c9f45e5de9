import { dismissToast, useToasts } from '@/lib/toast';
import { cn } from '@/lib/cn';
import { Icon } from './icons';

/** Passing messages, announced politely to screen readers, bottom of the screen above the thumb. */
export function Toaster() {
  const toasts = useToasts();
  return (
    <div aria-live="polite" className="pointer-events-none fixed inset-x-0 bottom-0 z-50 flex flex-col items-center gap-2 p-3 sm:items-end sm:p-5">
      {toasts.map((t) => (
        <div
          key={t.id}
          role={t.tone === 'critical' ? 'alert' : 'status'}
          className={cn(
            'pointer-events-auto flex w-full max-w-md items-start gap-3 rounded-lg border px-4 py-3 shadow-lg',
            t.tone === 'critical' && 'border-critical/50 bg-critical-soft',
            t.tone === 'ok' && 'border-ok/40 bg-ok-soft',
            t.tone === 'info' && 'border-info/40 bg-info-soft',
          )}
        >
          <Icon
            name={t.tone === 'critical' ? 'alert' : t.tone === 'ok' ? 'check' : 'info'}
            className={cn('mt-0.5', t.tone === 'critical' ? 'text-critical' : t.tone === 'ok' ? 'text-ok' : 'text-info')}
          />
          <p className="flex-1 text-sm font-bold text-fg">{t.message}</p>
          <button
            type="button"
            onClick={() => dismissToast(t.id)}
            className="-m-2 inline-flex size-11 items-center justify-center rounded text-fg-muted hover:text-fg"
            aria-label="Dismiss"
          >
            <Icon name="close" className="size-4" />
          </button>
        </div>
      ))}
    </div>
  );
}
