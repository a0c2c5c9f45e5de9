import { useQuery } from '@tanstack/react-query';
import { useSearchParams } from 'react-router-dom';
import { EXPORT_TABLES, type ExportTable } from '@common/schemas/usage.schema';
import { formatDateTime, formatNumber } from '@/lib/format';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Icon } from '@/components/ui/icons';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { exportUrl, importsQueries } from '../api/imports-api';
import { JobPanel, StatusBadge } from './job-panel';
import { UploadForm } from './upload-form';

const EXPORT_LABELS: Record<ExportTable, string> = {
  usage_reports: 'Ward usage reports',
  readings: 'Readings of every source',
  sources: 'Supply sources',
  wards: 'Wards',
  therapy_lines: 'Therapy lines (demand model)',
  deliveries: 'Scheduled deliveries',
  flow_meter_readings: 'Flow-meter totals',
  usage_history: 'Historic usage',
  imports: 'Uploads',
};

/**
 * Uploads of a site: a new upload or the one being looked at (its id is in the address, so a reload
 * comes back to the same progress bar), the recent uploads, and CSV exports of the site's tables.
 */
export function UploadsScreen({ siteId }: { siteId: number }) {
  const [params, setParams] = useSearchParams();
  const jobId = Number(params.get('upload')) || null;
  const kinds = useQuery(importsQueries.kinds());
  const list = useQuery(importsQueries.list(siteId));
  const open = (id: number | null) => setParams(id ? { upload: String(id) } : {}, { replace: false });

  return (
    <div className="grid gap-5 xl:grid-cols-[minmax(0,1fr)_22rem]">
      <div className="flex min-w-0 flex-col gap-5">
        {jobId ? (
          <JobPanel key={jobId} id={jobId} onNew={() => open(null)} />
        ) : kinds.isPending ? (
          <Card>
            <LoadingState />
          </Card>
        ) : kinds.isError ? (
          <Card>
            <ErrorState error={kinds.error} onRetry={() => kinds.refetch()} />
          </Card>
        ) : (
          <UploadForm siteId={siteId} maxMb={kinds.data.maxMb} onUploaded={(job) => open(job.id)} />
        )}
        <Card>
          <CardHeader title="Recent uploads" description="Checked and imported in the background; each keeps its file until it is imported or discarded." />
          {list.isPending ? (
            <LoadingState />
          ) : list.isError ? (
            <ErrorState error={list.error} onRetry={() => list.refetch()} />
          ) : list.data.length === 0 ? (
            <CardBody className="text-fg-muted">No uploads at this site yet.</CardBody>
          ) : (
            <ul className="divide-y divide-line">
              {list.data.map((j) => (
                <li key={j.id}>
                  <button
                    type="button"
                    onClick={() => open(j.id)}
                    aria-current={j.id === jobId || undefined}
                    className="flex min-h-14 w-full flex-wrap items-center justify-between gap-2 px-4 py-2 text-left hover:bg-primary-soft aria-[current]:bg-primary-soft sm:px-5"
                  >
                    <span className="min-w-0">
                      <span className="block truncate font-bold">{j.file?.name ?? `Upload ${j.id}`}</span>
                      <span className="block text-sm text-fg-muted">
                        {j.kindLabel} · {formatDateTime(j.createdAt)}
                        {j.status === 'done' ? ` · ${formatNumber(j.insertedRows)} rows` : j.totalRows ? ` · ${formatNumber(j.totalRows)} rows` : ''}
                      </span>
                    </span>
                    <StatusBadge status={j.status} />
                  </button>
                </li>
              ))}
            </ul>
          )}
        </Card>
      </div>
      <Card className="self-start">
        <CardHeader title="Export as CSV" description="Opens in a spreadsheet; text that starts like a formula is written so it stays text." />
        <ul className="divide-y divide-line">
          {EXPORT_TABLES.map((t) => (
            <li key={t}>
              <a
                href={exportUrl(siteId, t)}
                download
                className="flex min-h-12 items-center justify-between gap-3 px-4 py-2 font-bold text-primary hover:bg-primary-soft sm:px-5"
              >
                {EXPORT_LABELS[t]}
                <Icon name="download" />
              </a>
            </li>
          ))}
        </ul>
      </Card>
    </div>
  );
}
