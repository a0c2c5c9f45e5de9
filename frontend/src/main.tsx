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
  // a loader of the screen being opened may be the one that found out: come back to that screen
  const { pathname, search } = router.state.navigation.location ?? router.state.location;
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
