import { useLocation } from 'react-router-dom';
import { ButtonLink } from '@/components/ui/button';
import { Icon } from '@/components/ui/icons';

export function Component() {
  const { pathname } = useLocation();
  return (
    <div className="mx-auto flex max-w-xl flex-col items-start gap-3 py-10">
      <Icon name="info" className="size-10 text-info" />
      <h1 className="text-2xl">Page not found</h1>
      <p className="text-fg-muted">
        There is no screen at <code className="rounded bg-surface-sunken px-1 font-mono text-sm">{pathname}</code>. The link may be old, or the screen not built
        yet.
      </p>
      <ButtonLink to="/" className="mt-2">
        Go to Today
      </ButtonLink>
    </div>
  );
}
