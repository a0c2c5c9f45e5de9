import type { ReactNode } from 'react';
import { SOURCE_STATUS, type SourceStatus, type StatusTone } from '@common/forecast/status';
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

export const badgeClasses = variants('inline-flex items-center gap-1 rounded-full border px-2.5 py-0.5 text-sm font-bold whitespace-nowrap', badgeConfig, {
  tone: 'neutral',
});
export type Tone = keyof (typeof badgeConfig)['tone'];

export function Badge({ tone, className, icon, children }: VariantProps<typeof badgeConfig> & { className?: string; icon?: IconName; children: ReactNode }) {
  return (
    <span className={badgeClasses({ tone, className })}>
      {icon && <Icon name={icon} className="size-4" />}
      {children}
    </span>
  );
}

const STATUS_ICON: Record<StatusTone, IconName> = { critical: 'alert', warn: 'alert', watch: 'info', neutral: 'info', ok: 'check' };

/** Supply status, always in words as well as colour (and a shape, for those who see no colour). */
export function StatusBadge({ status, className }: { status: SourceStatus; className?: string }) {
  const s = Object.hasOwn(SOURCE_STATUS, status) ? SOURCE_STATUS[status] : SOURCE_STATUS.unknown;
  return (
    <Badge tone={s.tone} icon={STATUS_ICON[s.tone]} className={className}>
      {s.label}
    </Badge>
  );
}
