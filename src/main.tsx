import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
// The standard axes (weight, width, slant): the wordmark is set wide and heavy.
import '@fontsource-variable/roboto-flex/standard.css';
import './styles.css';
import { AppProvider } from './app/provider';
import { AppRouter } from './app/router';
import { offerUpdate } from './lib/offline/updates';
import { settleSignOut } from './features/auth/api';

// A sign-out made offline reaches the server as soon as it can.
const settle = () => void settleSignOut().catch(() => undefined);
settle();
window.addEventListener('online', settle);

// The installable shell (production builds only): the service worker keeps the client on the device.
if (import.meta.env.PROD && 'serviceWorker' in navigator) {
  void import('virtual:pwa-register').then(({ registerSW }) => {
    const update = registerSW({ onNeedRefresh: () => offerUpdate(() => void update(true)) });
  });
}

createRoot(document.getElementById('root')!).render(
  <StrictMode>
    <AppProvider>
      <AppRouter />
    </AppProvider>
  </StrictMode>,
);
