import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { applyServerErrors } from '@/lib/form-errors';
import { formatDateTime } from '@/lib/format';
import { toast } from '@/lib/toast';
import { Alert } from '@/components/ui/alert';
import { Badge } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { Card, CardBody } from '@/components/ui/card';
import { Dialog, FormActions } from '@/components/ui/dialog';
import { Field, Input, Textarea } from '@/components/ui/field';
import { Icon } from '@/components/ui/icons';
import { capacityQueries, useSignOff, type CapacityResponse, type CapacityWhatIf } from '../api/capacity-api';

const formSchema = z.object({
  engineerName: z.string().trim().min(1, 'enter the name of the engineer signing off').max(190),
  note: z.string().trim().max(1000),
});

/**
 * Who signed the check off and whether it still matches the inputs; the engineer signs from here. The
 * server recomputes the check and refuses the sign-off if the inputs changed since this page loaded.
 */
export function SignoffPanel({
  report,
  whatIf,
  canSign,
  engineerName,
  timeZone,
}: {
  report: CapacityResponse;
  whatIf: CapacityWhatIf;
  canSign: boolean;
  engineerName: string;
  timeZone: string;
}) {
  const [open, setOpen] = useState(false);
  const [showHistory, setShowHistory] = useState(false);
  const latest = report.latestSignoff;
  const history = useQuery({ ...capacityQueries.signoffs(report.site.id), enabled: showHistory });
  return (
    <Card>
      <CardBody className="flex flex-col gap-3">
        <div className="flex flex-wrap items-start justify-between gap-3">
          <div>
            <h2 className="text-lg">Engineer's sign-off</h2>
            {latest ? (
              <p className="text-sm">
                Signed off by <strong>{latest.engineerName}</strong> on {formatDateTime(latest.signedAt, timeZone)}{' '}
                {latest.current ? (
                  <Badge tone="ok" icon="check">
                    Matches these inputs
                  </Badge>
                ) : (
                  <Badge tone="warn" icon="alert">
                    Inputs changed since
                  </Badge>
                )}
              </p>
            ) : (
              <p className="text-sm text-fg-muted">Not signed off yet.</p>
            )}
          </div>
          <div className="flex flex-wrap gap-2">
            <Button variant="ghost" size="sm" onClick={() => setShowHistory((s) => !s)} aria-expanded={showHistory}>
              {showHistory ? 'Hide history' : 'History'}
            </Button>
            {canSign && (
              <Button onClick={() => setOpen(true)} disabled={report.zoneCount === 0}>
                <Icon name="check" />
                Sign off this check
              </Button>
            )}
          </div>
        </div>
        {showHistory && (
          <div className="text-sm">
            {history.isPending ? (
              <p className="text-fg-muted">Loading…</p>
            ) : history.isError ? (
              <p className="text-critical">The history could not be loaded.</p>
            ) : history.data.length === 0 ? (
              <p className="text-fg-muted">No sign-offs recorded for this site.</p>
            ) : (
              <ul className="divide-y divide-line rounded-lg border border-line">
                {history.data.map((s) => (
                  <li key={s.id} className="flex flex-wrap items-center justify-between gap-2 px-3 py-2">
                    <span>
                      <strong>{s.engineerName}</strong>, {formatDateTime(s.signedAt, timeZone)}
                      {s.note && <span className="block text-fg-muted">{s.note}</span>}
                    </span>
                    <Link to={`/capacity/signoffs/${s.id}`} className="font-bold text-primary underline">
                      Report as signed
                    </Link>
                  </li>
                ))}
              </ul>
            )}
          </div>
        )}
      </CardBody>
      <Dialog open={open} onClose={() => setOpen(false)} title="Sign off this capacity check" description={report.site.name}>
        {open && <SignoffForm report={report} whatIf={whatIf} engineerName={engineerName} onDone={() => setOpen(false)} />}
      </Dialog>
    </Card>
  );
}

function SignoffForm({ report, whatIf, engineerName, onDone }: { report: CapacityResponse; whatIf: CapacityWhatIf; engineerName: string; onDone: () => void }) {
  const sign = useSignOff(report.site.id);
  const [banner, setBanner] = useState<string | null>(null);
  const { register, handleSubmit, setError, formState } = useForm({ resolver: zodResolver(formSchema), defaultValues: { engineerName, note: '' } });
  const onSubmit = handleSubmit((body) => {
    setBanner(null);
    sign.mutate(
      { ...body, ...whatIf, inputsHash: report.inputsHash },
      {
        onSuccess: () => {
          toast.ok('Sign-off recorded.');
          onDone();
        },
        onError: (error) => setBanner(applyServerErrors(error, setError, ['engineerName', 'note'])),
      },
    );
  });
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      {banner && (
        <Alert tone="critical" title="Not signed off" role="alert">
          {banner}
        </Alert>
      )}
      <Alert tone="warn" title="What you sign">
        {report.caution} You sign the figures on this screen, computed from the inputs shown in the report; the name, the date and the report are recorded. A
        later change to the zones, pipe runs, sources or rules marks the sign-off as out of date; the daily demand forecast does not.
      </Alert>
      <Field label="Engineer's name" error={formState.errors.engineerName?.message}>
        {(c) => <Input {...c} {...register('engineerName')} autoComplete="name" />}
      </Field>
      <Field label="Note" hint="Optional: what you checked, e.g. against the as-built drawings." error={formState.errors.note?.message}>
        {(c) => <Textarea {...c} {...register('note')} rows={3} />}
      </Field>
      <FormActions onCancel={onDone} busy={sign.isPending} submitLabel="Sign off" />
    </form>
  );
}
