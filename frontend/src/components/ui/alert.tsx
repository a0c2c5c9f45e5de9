import type { ReactNode } from 'react';
import { variants, type VariantProps } from '@/lib/variants';
import { Icon, type IconName } from './icons';

const alertConfig = {
  tone: {
    info: 'bg-info-soft border-info/40 text-fg [&_[data-icon]]:text-info',
    ok: 'bg-ok-soft border-ok/40 text-fg [&_[data-icon]]:text-ok',
    watch: 'bg-watch-soft border-watch/40 text-fg [&_[data-icon]]:text-watch',
    warn: 'bg-warn-soft border-warn/40 text-fg [&_[data-icon]]:text-warn',
    critical: 'bg-critical-soft border-critical/50 text-fg [&_[data-icon]]:text-critical',
  },
};
const ICON: Record<keyof (typeof alertConfig)['tone'], IconName> = { info: 'info', ok: 'check', watch: 'info', warn: 'alert', critical: 'alert' };

export const alertClasses = variants('flex gap-3 rounded-lg border px-4 py-3 text-sm', alertConfig, { tone: 'info' });

/** A message in the flow of the page: cautions, form-level errors, notes. */
export function Alert({
  tone = 'info',
  title,
  children,
  className,
  role,
  action,
}: VariantProps<typeof alertConfig> & { title?: ReactNode; children?: ReactNode; className?: string; role?: 'alert' | 'status'; action?: ReactNode }) {
  return (
    <div className={alertClasses({ tone, className })} role={role}>
      <span data-icon className="mt-0.5">
        <Icon name={ICON[tone]} />
      </span>
      <div className="min-w-0 flex-1 space-y-1">
        {title && <p className="font-bold">{title}</p>}
        {children && <div className="text-fg">{children}</div>}
        {action && <div className="pt-1">{action}</div>}
      </div>
    </div>
  );
}
