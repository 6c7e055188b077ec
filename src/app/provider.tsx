import { QueryCache, QueryClient } from '@tanstack/react-query';
import { PersistQueryClientProvider } from '@tanstack/react-query-persist-client';
import { useState, type ReactNode } from 'react';
import { ApiError } from '../lib/api-client';
import { Toaster, toast } from '../components/ui/toast';
import { KEPT_FOR_MS, keptOffline, queryPersister } from '../lib/offline/device-store';

declare const __LASHLINE_BUILD__: string | undefined;
/** Answers kept by another build of the client may not fit this one's screens: they are dropped. */
const BUILD = typeof __LASHLINE_BUILD__ === 'string' ? __LASHLINE_BUILD__ : 'dev';

function makeClient() {
  const client: QueryClient = new QueryClient({
    queryCache: new QueryCache({
      onError: (error, query) => {
        // A failed background refetch only interrupts when something is already on screen.
        if (query.state.data !== undefined) toast(error.message);
      },
    }),
    defaultOptions: {
      queries: {
        staleTime: 30_000,
        // Kept on the device for reading offline (IndexedDB): as long as they are kept there.
        gcTime: KEPT_FOR_MS,
        retry: (n, e) => !(e instanceof ApiError && e.status >= 400 && e.status < 500) && n < 2,
        throwOnError: (e) => e instanceof ApiError && e.status >= 500,
      },
    },
  });
  return client;
}

export function AppProvider({ children }: { children: ReactNode }) {
  const [client] = useState(makeClient);
  return (
    <PersistQueryClientProvider
      client={client}
      persistOptions={{
        persister: queryPersister,
        maxAge: KEPT_FOR_MS,
        buster: BUILD,
        // Only answers that arrived whole, of the kinds a tablet reads offline.
        // "Nobody signed in" is never kept: it would turn the next person away on a reload.
        dehydrateOptions: { shouldDehydrateQuery: (q) => q.state.status === 'success' && q.state.data != null && keptOffline(q.queryKey) },
      }}
      // What the device kept is shown at once, and read again from the server straight away: online,
      // nothing on screen stays as old as the device's copy.
      onSuccess={() => void client.invalidateQueries()}
    >
      {children}
      <Toaster />
    </PersistQueryClientProvider>
  );
}
