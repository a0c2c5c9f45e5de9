import { Badge, type Tone } from '@/components/ui/badge';
import type { IconName } from '@/components/ui/icons';

const REQUEST: Record<string, { tone: Tone; icon: IconName }> = {
  draft: { tone: 'neutral', icon: 'pencil' },
  submitted: { tone: 'warn', icon: 'clock' },
  approved: { tone: 'info', icon: 'check' },
  ordered: { tone: 'info', icon: 'mail' },
  part_delivered: { tone: 'watch', icon: 'check' },
  delivered: { tone: 'ok', icon: 'check' },
  rejected: { tone: 'critical', icon: 'close' },
  cancelled: { tone: 'neutral', icon: 'close' },
};

/** A request's or order's status in words, colour and an icon. */
export function OrderStatusBadge({ status, text }: { status: string; text: string }) {
  const s = REQUEST[status] ?? { tone: 'neutral' as Tone, icon: 'info' as IconName };
  return (
    <Badge tone={s.tone} icon={s.icon}>
      {text}
    </Badge>
  );
}
