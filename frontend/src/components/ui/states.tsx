import type { ReactNode } from 'react';
import { ApiError, errorMessage } from '@/lib/api-client';
import { cn } from '@/lib/cn';
import { Button } from './button';
import { Icon, type IconName } from './icons';
import { Spinner } from './spinner';

/** Loading, empty and error states that every list and panel shows in the same way. */

export function LoadingState({ label = 'Loading…', className }: { label?: string; className?: string }) {
  return (
    <div role="status" className={cn('flex items-center justify-center gap-3 px-4 py-10 text-fg-muted', className)}>
      <Spinner />
      <span>{label}</span>
    </div>
  );
}

export function EmptyState({
  title,
  children,
  icon = 'info',
  action,
  className,
}: {
  title: ReactNode;
  children?: ReactNode;
  icon?: IconName;
  action?: ReactNode;
  className?: string;
}) {
  return (
    <div className={cn('flex flex-col items-center gap-2 px-4 py-10 text-center', className)}>
      <Icon name={icon} className="size-8 text-sand-500" />
      <p className="text-lg font-bold">{title}</p>
      {children && <div className="max-w-prose text-fg-muted">{children}</div>}
      {action && <div className="pt-2">{action}</div>}
    </div>
  );
}

/** Says what went wrong in words a person can act on; offers a retry where one can help. */
export function ErrorState({ error, title, onRetry, className }: { error: unknown; title?: ReactNode; onRetry?: () => void; className?: string }) {
  const forbidden = error instanceof ApiError && error.status === 403;
  return (
    <div role="alert" className={cn('flex flex-col items-center gap-2 px-4 py-10 text-center', className)}>
      <Icon name={forbidden ? 'lock' : 'alert'} className="size-8 text-critical" />
      <p className="text-lg font-bold">{title ?? (forbidden ? 'Not available for your role' : 'This could not be loaded')}</p>
      <p className="max-w-prose text-fg-muted">{errorMessage(error)}</p>
      {onRetry && !forbidden && (
        <Button variant="secondary" onClick={onRetry} className="mt-2">
          <Icon name="refresh" />
          Try again
        </Button>
      )}
    </div>
  );
}
