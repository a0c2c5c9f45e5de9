import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { RouterProvider } from 'react-router-dom';
import '@fontsource/lato/400.css';
import '@fontsource/lato/700.css';
import '@fontsource/lato/900.css';
import './index.css';
import { setUnauthorisedHandler } from '@/lib/api-client';
import { queryClient } from '@/lib/query-client';
import { AppProvider } from '@/app/provider';
import { createAppRouter } from '@/app/router';

const router = createAppRouter();

// the session ended (expired, signed out elsewhere): drop what we hold and ask to sign in again
setUnauthorisedHandler(() => {
  const { pathname, search } = window.location;
  if (pathname.startsWith('/sign-in')) return;
  // leave the signed-in screens first, then forget their data (see useSignOut)
  void router.navigate(`/sign-in?next=${encodeURIComponent(pathname + search)}`, { replace: true }).then(() => queryClient.clear());
});

createRoot(document.getElementById('root')!).render(
  <StrictMode>
    <AppProvider>
      <RouterProvider router={router} />
    </AppProvider>
  </StrictMode>,
);
