import { Component, Suspense, type ErrorInfo, type ReactNode } from 'react';
import { QueryErrorResetBoundary } from '@tanstack/react-query';
import { Card } from './card';
import { ErrorState, LoadingState } from './states';

interface BoundaryProps {
  onReset: () => void;
  fallback: (error: unknown, reset: () => void) => ReactNode;
  children: ReactNode;
}

class Boundary extends Component<BoundaryProps, { error: unknown }> {
  state = { error: null as unknown };
  static getDerivedStateFromError(error: unknown) {
    return { error };
  }
  componentDidCatch(error: unknown, info: ErrorInfo) {
    console.error('Panel failed', error, info.componentStack);
  }
  reset = () => {
    this.props.onReset();
    this.setState({ error: null });
  };
  render() {
    if (this.state.error) return this.props.fallback(this.state.error, this.reset);
    return this.props.children;
  }
}

/**
 * Keeps one failing panel from taking the screen down: its own loading state while it suspends, its
 * own error and a retry that refetches the queries that failed.
 */
export function PanelBoundary({ children, title, loadingLabel, bare = false }: { children: ReactNode; title?: string; loadingLabel?: string; bare?: boolean }) {
  return (
    <QueryErrorResetBoundary>
      {({ reset }) => (
        <Boundary
          onReset={reset}
          fallback={(error, retry) => {
            const body = <ErrorState error={error} title={title ? `${title} could not be shown` : undefined} onRetry={retry} />;
            return bare ? body : <Card>{body}</Card>;
          }}
        >
          <Suspense
            fallback={
              bare ? (
                <LoadingState label={loadingLabel} />
              ) : (
                <Card>
                  <LoadingState label={loadingLabel} />
                </Card>
              )
            }
          >
            {children}
          </Suspense>
        </Boundary>
      )}
    </QueryErrorResetBoundary>
  );
}
