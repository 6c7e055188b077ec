import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
// The standard axes (weight, width, slant): the wordmark is set wide and heavy.
import '@fontsource-variable/roboto-flex/standard.css';
import './styles.css';
import { AppProvider } from './app/provider';
import { AppRouter } from './app/router';

createRoot(document.getElementById('root')!).render(
  <StrictMode>
    <AppProvider>
      <AppRouter />
    </AppProvider>
  </StrictMode>,
);
