import { useSuspenseQuery } from '@tanstack/react-query';
import { Button } from '@/components/ui/button';
import { capacityQueries } from '../api/capacity-api';
import { PrintableReport } from './printable-report';

/** A capacity report exactly as it was signed off (the stored snapshot), ready to print again. */
export function SignedReport({ id, timeZone }: { id: number; timeZone: string }) {
  const { data } = useSuspenseQuery(capacityQueries.signoff(id));
  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-wrap items-center justify-between gap-3 print:hidden">
        <p className="text-fg-muted">As signed off by {data.engineerName}: the figures below are the stored report, not a new computation.</p>
        <Button variant="secondary" onClick={() => window.print()}>
          Print
        </Button>
      </div>
      <PrintableReport report={data.report} signoff={data} timeZone={timeZone} onScreen />
    </div>
  );
}
