import { useMemo } from 'react';
import { createColumnHelper } from '@tanstack/react-table';
import { formatDateTime, formatKg, formatLitres, formatRelative } from '@/lib/format';
import { Card, CardHeader } from '@/components/ui/card';
import { DataTable } from '@/components/ui/data-table';
import { EmptyState } from '@/components/ui/states';
import type { Reading, SourceDetail } from '../api/sources-api';
import { describeReading, READING_METHOD_LABEL } from '../lib/source-labels';

const col = createColumnHelper<Reading>();

/** The latest 20 readings: when, what the gauge said, what it means, how and by whom. */
export function ReadingsCard({ detail, meId }: { detail: SourceDetail; meId: number }) {
  const tz = detail.site.timeZone;
  const unit = detail.outlook.unit;
  const calibrationUnit = detail.source.calibrationUnit;
  const columns = useMemo(() => {
    // "You" for the signed-in user, else the name the API gives (same organisation only)
    const who = (r: Reading) => (r.takenByUserId === null ? null : r.takenByUserId === meId ? 'You' : (r.takenByName ?? 'A colleague'));
    return [
      col.accessor('takenAt', {
        header: 'Taken',
        cell: (info) => (
          <span className="whitespace-nowrap">
            {formatDateTime(info.getValue(), tz)}
            <span className="block text-xs text-fg-muted">{formatRelative(info.getValue())}</span>
          </span>
        ),
      }),
      col.display({
        id: 'reading',
        header: 'Reading',
        cell: (info) => {
          const r = info.row.original;
          return (
            <span>
              {describeReading(r, calibrationUnit)}
              {/* on phones the method and who ride under the reading */}
              <span className="block text-xs text-fg-muted md:hidden">
                {READING_METHOD_LABEL[r.method] ?? r.method}
                {who(r) && ` · ${who(r)}`}
              </span>
              {r.note && <span className="block text-xs text-fg-muted italic">{r.note}</span>}
            </span>
          );
        },
      }),
      col.accessor('contents', {
        header: unit === 'kg' ? 'Contents' : 'Free gas',
        meta: { numeric: true },
        cell: (info) => <span className="whitespace-nowrap">{unit === 'kg' ? formatKg(info.getValue()) : formatLitres(info.getValue())}</span>,
      }),
      col.accessor('method', {
        header: 'Method',
        meta: { className: 'hidden md:table-cell' },
        cell: (info) => READING_METHOD_LABEL[info.getValue()] ?? info.getValue(),
      }),
      col.display({
        id: 'who',
        header: 'Who',
        meta: { className: 'hidden md:table-cell' },
        cell: (info) => who(info.row.original) ?? (info.row.original.method === 'telemetry' ? 'Feed' : '–'),
      }),
    ];
  }, [tz, unit, calibrationUnit, meId]);

  return (
    <Card>
      <CardHeader title="Readings" description="The latest 20, newest first, in site time." />
      {detail.readings.length === 0 ? (
        <EmptyState title="No readings yet" icon="clock">
          The forecast starts from the newest reading: enter one to begin.
        </EmptyState>
      ) : (
        <DataTable caption="Readings of this source" columns={columns} data={detail.readings} getRowId={(r) => r.id} />
      )}
    </Card>
  );
}
