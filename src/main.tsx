import '@fontsource/inter/400.css';
import '@fontsource/inter/600.css';
import '@fontsource/inter/700.css';
import '@fontsource/jetbrains-mono/400.css';
import '@fontsource/jetbrains-mono/600.css';
import './index.css';
import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { AppProvider } from './app/provider';
import { AppRouter } from './app/router';
import { UpdateNotice } from './features/app-worker/components/update-notice';
import { startAppWorker } from './features/app-worker/register';
import { keepSessionOnDevice } from './features/auth/last-session';
import { queryClient } from './lib/query-client';

// The signed-in person is kept on the device and the app shell cached, so /scan opens offline.
keepSessionOnDevice(queryClient);
startAppWorker();

createRoot(document.getElementById('root')!).render(
  <StrictMode>
    <AppProvider>
      <AppRouter />
      <UpdateNotice />
    </AppProvider>
  </StrictMode>,
);
