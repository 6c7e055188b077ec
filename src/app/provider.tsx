import { QueryCache, QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { useState, type ReactNode } from 'react';
import { ApiError } from '../lib/api-client';
import { Toaster, toast } from '../components/ui/toast';

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
    <QueryClientProvider client={client}>
      {children}
      <Toaster />
    </QueryClientProvider>
  );
}
