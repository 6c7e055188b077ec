import { useSyncExternalStore } from 'react';

/**
 * A newer version of the client, downloaded by the service worker and waiting: taken only when the
 * person says so, never under an open card.
 */
let apply: (() => void) | null = null;
const listeners = new Set<() => void>();

export function offerUpdate(take: () => void) {
  apply = take;
  for (const l of listeners) l();
}

export const useUpdateOffer = () =>
  useSyncExternalStore(
    (l) => {
      listeners.add(l);
      return () => listeners.delete(l);
    },
    () => apply,
    () => null,
  );
