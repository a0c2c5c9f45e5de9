import { cn } from '@/lib/cn';

/** Plenum's mark: a chamber with its valve, drawn for us. Decorative: the word beside it names the app. */
export function PlenumMark({ className }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" aria-hidden="true" focusable="false" className={cn('size-8 shrink-0', className)}>
      <rect width="32" height="32" rx="8" fill="var(--color-ink-800)" />
      <path d="M10.5 7.5h11" stroke="#f0b25a" strokeWidth="2.6" strokeLinecap="round" />
      <path d="M16 8v6" stroke="var(--color-ink-50)" strokeWidth="2.6" strokeLinecap="round" />
      <rect x="6.5" y="14" width="19" height="11" rx="3.5" fill="none" stroke="var(--color-ink-50)" strokeWidth="2.6" />
      <path d="M11 19.5h10" stroke="#f0b25a" strokeWidth="2.2" strokeLinecap="round" />
    </svg>
  );
}

export function PlenumWordmark({ className, inverted = false }: { className?: string; inverted?: boolean }) {
  return (
    <span className={cn('inline-flex items-center gap-2', className)}>
      <PlenumMark />
      <span className={cn('text-xl font-black tracking-tight', inverted ? 'text-white' : 'text-primary')}>Plenum</span>
    </span>
  );
}
