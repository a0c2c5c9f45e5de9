import { cn } from '@/lib/cn';

export type ColourConvention = 'ISO32' | 'CGA_C9' | string;

/** The colours a gas's cylinders carry under the site's convention (ISO 32 in Europe, CGA C-9 in the US). */
export function coloursFor(gas: { iso32Colours: string[]; cgaColours: string[] }, convention: ColourConvention): string[] {
  return convention === 'CGA_C9' ? gas.cgaColours : gas.iso32Colours;
}

/**
 * Small colour bands as on a cylinder shoulder, always next to the gas name (colour alone never
 * identifies a gas: read the label on the cylinder).
 */
export function GasSwatch({ colours, label, className, showLabel = true }: { colours: string[]; label: string; className?: string; showLabel?: boolean }) {
  return (
    <span className={cn('inline-flex items-center gap-2', className)}>
      <span className="inline-flex h-4 w-7 shrink-0 overflow-hidden rounded-full border border-line-strong" aria-hidden="true">
        {colours.length === 0 ? (
          <span className="h-full w-full bg-[repeating-linear-gradient(45deg,var(--color-sand-200)_0_3px,var(--color-surface)_3px_6px)]" />
        ) : (
          colours.map((c, i) => <span key={i} className="h-full flex-1" style={{ backgroundColor: c }} />)
        )}
      </span>
      {showLabel && <span>{label}</span>}
    </span>
  );
}
