import { useEffect, type ReactNode } from 'react';
import { cn } from '@/lib/cn';

export function PageHeader({ title, description, actions, className }: { title: string; description?: ReactNode; actions?: ReactNode; className?: string }) {
  useEffect(() => {
    document.title = `${title} · Plenum`;
  }, [title]);
  return (
    <header className={cn('mb-5 flex flex-wrap items-end justify-between gap-3', className)}>
      <div className="min-w-0">
        <h1 className="text-2xl text-fg sm:text-3xl">{title}</h1>
        {description && <p className="mt-1 max-w-prose text-fg-muted">{description}</p>}
      </div>
      {actions && <div className="flex flex-wrap gap-2">{actions}</div>}
    </header>
  );
}
