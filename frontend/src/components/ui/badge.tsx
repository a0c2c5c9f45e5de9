import type { ReactNode } from 'react';
import { variants, type VariantProps } from '@/lib/variants';
import { Icon, type IconName } from './icons';

const badgeConfig = {
  tone: {
    ok: 'bg-ok-soft text-ok border-ok/30',
    watch: 'bg-watch-soft text-watch border-watch/30',
    warn: 'bg-warn-soft text-warn border-warn/30',
    critical: 'bg-critical-soft text-critical border-critical/30',
    info: 'bg-info-soft text-info border-info/30',
    neutral: 'bg-surface-sunken text-fg-muted border-line',
  },
};

export const badgeClasses = variants('inline-flex items-center gap-1 rounded-full border px-2.5 py-0.5 text-sm font-bold whitespace-nowrap', badgeConfig, { tone: 'neutral' });
export type Tone = keyof (typeof badgeConfig)['tone'];

export function Badge({ tone, className, icon, children }: VariantProps<typeof badgeConfig> & { className?: string; icon?: IconName; children: ReactNode }) {
  return (
    <span className={badgeClasses({ tone, className })}>
      {icon && <Icon name={icon} className="size-4" />}
      {children}
    </span>
  );
}

/** Supply status, always in words as well as colour (and a shape, for those who see no colour). */
export type SupplyStatus = 'ok' | 'watch' | 'reorder' | 'critical';

export const SUPPLY_STATUS: Record<SupplyStatus, { label: string; tone: Tone; icon: IconName; rank: number }> = {
  critical: { label: 'Critical', tone: 'critical', icon: 'alert', rank: 0 },
  reorder: { label: 'Reorder now', tone: 'warn', icon: 'alert', rank: 1 },
  watch: { label: 'Watch', tone: 'watch', icon: 'info', rank: 2 },
  ok: { label: 'OK', tone: 'ok', icon: 'check', rank: 3 },
};

export function StatusBadge({ status, className }: { status: SupplyStatus; className?: string }) {
  const s = SUPPLY_STATUS[status] ?? SUPPLY_STATUS.watch;
  return (
    <Badge tone={s.tone} icon={s.icon} className={className}>
      {s.label}
    </Badge>
  );
}
