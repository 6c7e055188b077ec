import { useSyncExternalStore } from 'react';

const subscribe = (onChange: () => void) => {
  window.addEventListener('online', onChange);
  window.addEventListener('offline', onChange);
  return () => {
    window.removeEventListener('online', onChange);
    window.removeEventListener('offline', onChange);
  };
};

/** Whether the browser says it has a connection (it may still fail: a failed send queues too). */
export const useOnline = () => useSyncExternalStore(subscribe, () => navigator.onLine, () => true);
