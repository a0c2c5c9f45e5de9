import { isRouteErrorResponse, Link, useRouteError } from 'react-router-dom';
import { ApiError, errorMessage } from '@/lib/api-client';
import { buttonClasses } from '@/components/ui/button';
import { Icon } from '@/components/ui/icons';
import { PlenumWordmark } from '@/components/ui/logo';

function describe(error: unknown): { title: string; text: string; status?: number } {
  if (isRouteErrorResponse(error)) {
    const msg = (error.data as { message?: string } | undefined)?.message;
    if (error.status === 403)
      return { status: 403, title: 'Not available for your role', text: msg ?? 'Your roles do not include this screen. Ask an administrator if you need it.' };
    if (error.status === 404) return { status: 404, title: 'Not found', text: msg ?? 'There is nothing at this address.' };
    return { status: error.status, title: 'Something went wrong', text: msg ?? error.statusText };
  }
  if (error instanceof ApiError) {
    if (error.status === 403) return { status: 403, title: 'Not available for your role', text: error.message };
    if (error.status === 404) return { status: 404, title: 'Not found', text: error.message };
    return { status: error.status, title: 'This screen could not be loaded', text: error.message };
  }
  // a new version was deployed while this page was open: its old chunks are gone
  if (error instanceof TypeError && /dynamically imported module|Importing a module script failed|Failed to fetch/i.test(error.message)) {
    return { title: 'Plenum has been updated', text: 'Reload the page to get the new version.' };
  }
  return { title: 'Something went wrong', text: errorMessage(error) };
}

/** Inside the app frame: the navigation stays, so the person can go elsewhere. */
export function ScreenErrorBoundary() {
  const error = useRouteError();
  const d = describe(error);
  if (d.status === undefined || d.status >= 500) console.error(error);
  return (
    <div role="alert" className="mx-auto flex max-w-xl flex-col items-start gap-3 py-10">
      <Icon name={d.status === 403 ? 'lock' : 'alert'} className="size-10 text-critical" />
      <h1 className="text-2xl">{d.title}</h1>
      <p className="text-fg-muted">{d.text}</p>
      <div className="flex flex-wrap gap-2 pt-2">
        {d.status !== 403 && d.status !== 404 && (
          <button type="button" className={buttonClasses({ variant: 'primary' })} onClick={() => window.location.reload()}>
            <Icon name="refresh" />
            Reload
          </button>
        )}
        <Link to="/" className={buttonClasses({ variant: d.status === 403 || d.status === 404 ? 'primary' : 'secondary' })}>
          Go to Today
        </Link>
      </div>
    </div>
  );
}

/** The last line: the frame itself failed (the session check, the first chunk). */
export function RootErrorBoundary() {
  const error = useRouteError();
  const d = describe(error);
  console.error(error);
  return (
    <div className="flex min-h-dvh flex-col items-center justify-center gap-4 px-4 text-center">
      <PlenumWordmark />
      <div role="alert" className="flex max-w-md flex-col items-center gap-3">
        <h1 className="text-2xl">{d.title}</h1>
        <p className="text-fg-muted">{d.text}</p>
        <button type="button" className={buttonClasses({ variant: 'primary', size: 'lg' })} onClick={() => window.location.reload()}>
          <Icon name="refresh" />
          Reload
        </button>
      </div>
    </div>
  );
}

export function FullPageLoading() {
  return (
    <div className="flex min-h-dvh flex-col items-center justify-center gap-3" role="status">
      <PlenumWordmark />
      <p className="text-fg-muted">Loading…</p>
    </div>
  );
}
