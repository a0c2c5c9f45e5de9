import { useEffect, useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { formatBytes, formatDateTime } from '@/lib/format';
import { cn } from '@/lib/cn';
import { Alert } from '@/components/ui/alert';
import { buttonClasses } from '@/components/ui/button';
import { Card, CardBody, CardHeader } from '@/components/ui/card';
import { Icon } from '@/components/ui/icons';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { attachmentUrl, mailQueries, type MailMessage } from '../api/mail-api';

export function MailMessageView({ id }: { id: number }) {
  const msg = useQuery(mailQueries.detail(id));
  if (msg.isPending) return <LoadingState label="Loading the message…" />;
  if (msg.isError) return <ErrorState error={msg.error} onRetry={() => msg.refetch()} />;
  return <Message m={msg.data} />;
}

function Message({ m }: { m: MailMessage }) {
  const [view, setView] = useState<'text' | 'html'>(m.text ? 'text' : 'html');
  useEffect(() => {
    document.title = `${m.subject || 'Mail'} · Plenum`;
  }, [m.subject]);
  return (
    <div className="flex flex-col gap-5">
      <Card>
        <CardHeader title={m.subject || '(no subject)'} />
        <CardBody>
          <dl className="grid gap-x-4 gap-y-1 text-sm sm:grid-cols-[6rem_1fr]">
            <dt className="font-bold text-fg-muted">From</dt>
            <dd className="break-all">{m.from}</dd>
            <dt className="font-bold text-fg-muted">To</dt>
            <dd className="break-all">{m.to}</dd>
            <dt className="font-bold text-fg-muted">Received</dt>
            <dd>{formatDateTime(m.receivedAt)}</dd>
          </dl>
        </CardBody>
      </Card>

      {m.attachments.length > 0 && (
        <Card>
          <CardHeader title={`Attachments (${m.attachments.length})`} />
          <ul className="divide-y divide-line">
            {m.attachments.map((a) => (
              <li key={a.id} className="flex flex-wrap items-center justify-between gap-3 px-4 py-3 sm:px-5">
                <span className="min-w-0">
                  <span className="block font-bold break-all">{a.filename}</span>
                  <span className="text-sm text-fg-muted">
                    {a.contentType} · {formatBytes(a.sizeBytes)}
                  </span>
                </span>
                <a href={attachmentUrl(m.id, a.id)} download={a.filename} className={buttonClasses({ variant: 'secondary', size: 'sm' })}>
                  <Icon name="download" className="size-4" />
                  Download <span className="sr-only">{a.filename}</span>
                </a>
              </li>
            ))}
          </ul>
        </Card>
      )}

      <Card>
        <div className="flex flex-wrap items-center justify-between gap-2 border-b border-line px-4 py-2 sm:px-5">
          <h2 className="text-lg">Message</h2>
          {m.text && m.html && (
            <div role="group" aria-label="Show the message as" className="inline-flex rounded-lg border border-line-strong p-0.5">
              {(['text', 'html'] as const).map((v) => (
                <button
                  key={v}
                  type="button"
                  aria-pressed={view === v}
                  onClick={() => setView(v)}
                  className={cn('min-h-10 rounded-md px-3 text-sm font-bold', view === v ? 'bg-primary text-primary-fg' : 'text-primary hover:bg-primary-soft')}
                >
                  {v === 'text' ? 'Plain text' : 'Formatted'}
                </button>
              ))}
            </div>
          )}
        </div>
        <CardBody>
          {view === 'text' && m.text ? (
            <pre className="font-sans text-sm break-words whitespace-pre-wrap">{m.text}</pre>
          ) : m.html ? (
            <div className="flex flex-col gap-2">
              <Alert tone="info">Shown in a locked frame: scripts, forms and links inside the message do not run.</Alert>
              {/* sandbox="" : no scripts, no same origin, no forms, no navigation */}
              <iframe
                title={`Message: ${m.subject}`}
                sandbox=""
                srcDoc={m.html}
                referrerPolicy="no-referrer"
                className="h-[60vh] w-full rounded-lg border border-line bg-white"
              />
            </div>
          ) : (
            <p className="text-fg-muted">The message has no body.</p>
          )}
        </CardBody>
      </Card>
    </div>
  );
}
