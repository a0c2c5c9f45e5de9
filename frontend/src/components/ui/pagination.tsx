import { formatNumber } from '@/lib/format';
import { Button } from './button';
import { Icon } from './icons';

/** Previous/next for a list the server pages, with where we are in words. */
export function Pagination({
  page,
  pageSize,
  total,
  onPage,
  busy,
}: {
  page: number;
  pageSize: number;
  total: number;
  onPage: (page: number) => void;
  busy?: boolean;
}) {
  const pages = Math.max(1, Math.ceil(total / pageSize));
  const from = total === 0 ? 0 : (page - 1) * pageSize + 1;
  const to = Math.min(total, page * pageSize);
  return (
    <nav aria-label="Pages" className="flex flex-wrap items-center justify-between gap-3 border-t border-line px-4 py-3">
      <p className="text-sm text-fg-muted" aria-live="polite">
        {total === 0 ? 'No rows' : `${formatNumber(from)}–${formatNumber(to)} of ${formatNumber(total)}`}
        {busy && ' · updating…'}
      </p>
      <div className="flex gap-2">
        <Button variant="secondary" size="sm" disabled={page <= 1} onClick={() => onPage(page - 1)}>
          <Icon name="chevronLeft" className="size-4" />
          Previous
        </Button>
        <span className="inline-flex items-center px-1 text-sm text-fg-muted">
          Page {page} of {pages}
        </span>
        <Button variant="secondary" size="sm" disabled={page >= pages} onClick={() => onPage(page + 1)}>
          Next
          <Icon name="chevronRight" className="size-4" />
        </Button>
      </div>
    </nav>
  );
}
