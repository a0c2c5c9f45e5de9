import type { ReactNode } from 'react';
import { cn } from '@/lib/cn';

/**
 * A figure around a chart: a caption people read, a fixed height the chart fills, and a text
 * alternative (the key numbers) for those who do not see the chart.
 */
export function ChartFrame({
  title,
  caption,
  summary,
  height = 260,
  className,
  children,
  legend,
}: {
  title: ReactNode;
  caption?: ReactNode;
  summary: string;
  height?: number;
  className?: string;
  children: ReactNode;
  legend?: ReactNode;
}) {
  return (
    <figure className={cn('flex flex-col gap-2', className)}>
      <figcaption>
        <span className="font-bold">{title}</span>
        {caption && <span className="block text-sm text-fg-muted">{caption}</span>}
      </figcaption>
      {legend}
      <div style={{ height }} role="img" aria-label={summary} className="w-full min-w-0">
        {children}
      </div>
    </figure>
  );
}

export function LegendItem({ colour, label, dashed = false }: { colour: string; label: ReactNode; dashed?: boolean }) {
  return (
    <span className="inline-flex items-center gap-2 text-sm">
      <svg width="28" height="8" aria-hidden="true">
        <line x1="0" y1="4" x2="28" y2="4" stroke={colour} strokeWidth="3" strokeDasharray={dashed ? '6 4' : undefined} />
      </svg>
      {label}
    </span>
  );
}
