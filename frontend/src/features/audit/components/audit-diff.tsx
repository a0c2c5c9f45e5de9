import { useState } from 'react';
import { cn } from '@/lib/cn';
import { Badge } from '@/components/ui/badge';
import { Checkbox } from '@/components/ui/field';
import { diffSnapshots, showValue, type DiffKind } from '../lib/diff-snapshots';

const KIND_LABEL: Record<DiffKind, { label: string; tone: 'ok' | 'critical' | 'watch' | 'neutral' }> = {
  added: { label: 'Added', tone: 'ok' },
  removed: { label: 'Removed', tone: 'critical' },
  changed: { label: 'Changed', tone: 'watch' },
  same: { label: 'Same', tone: 'neutral' },
};

export function AuditDiff({ before, after }: { before: unknown; after: unknown }) {
  const rows = diffSnapshots(before, after);
  const [showSame, setShowSame] = useState(false);
  const visible = showSame ? rows : rows.filter((r) => r.kind !== 'same');
  const sameCount = rows.length - rows.filter((r) => r.kind !== 'same').length;
  if (rows.length === 0) return <p className="text-fg-muted">This entry records an event without a before or after state.</p>;
  return (
    <div className="flex flex-col gap-3">
      {sameCount > 0 && (
        <Checkbox
          label={`Show ${sameCount} unchanged ${sameCount === 1 ? 'field' : 'fields'}`}
          checked={showSame}
          onChange={(e) => setShowSame(e.target.checked)}
        />
      )}
      <div className="overflow-x-auto">
        <table className="w-full border-collapse text-left text-sm">
          <caption className="sr-only">Changes</caption>
          <thead>
            <tr className="border-b border-line-strong text-fg-muted">
              <th scope="col" className="py-2 pr-3">
                Field
              </th>
              <th scope="col" className="py-2 pr-3">
                Change
              </th>
              <th scope="col" className="py-2 pr-3">
                Before
              </th>
              <th scope="col" className="py-2">
                After
              </th>
            </tr>
          </thead>
          <tbody>
            {visible.map((r) => (
              <tr key={r.path} className="border-b border-line align-top last:border-b-0">
                <th scope="row" className="py-2 pr-3 font-mono text-xs font-normal break-all">
                  {r.path}
                </th>
                <td className="py-2 pr-3">
                  <Badge tone={KIND_LABEL[r.kind].tone}>{KIND_LABEL[r.kind].label}</Badge>
                </td>
                <td
                  className={cn(
                    'py-2 pr-3 font-mono text-xs break-all whitespace-pre-wrap',
                    r.kind !== 'same' && r.kind !== 'added' && 'text-critical line-through decoration-1',
                  )}
                >
                  {showValue(r.before)}
                </td>
                <td className={cn('py-2 font-mono text-xs break-all whitespace-pre-wrap', r.kind !== 'same' && r.kind !== 'removed' && 'font-bold text-ok')}>
                  {showValue(r.after)}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </div>
  );
}
