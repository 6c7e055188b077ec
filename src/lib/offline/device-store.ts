import { clear, createStore, del, get, set } from 'idb-keyval';
import { createAsyncStoragePersister } from '@tanstack/query-async-storage-persister';

/** This device's own store (IndexedDB): the last answers read and the changes waiting to be sent. */
export const deviceStore = createStore('lashline', 'device');

export const QUERIES_KEY = 'lashline.queries';

/** Answers kept for reading offline, written at most once a second. */
export const queryPersister = createAsyncStoragePersister({
  storage: {
    getItem: (k) => get<string>(k, deviceStore).then((v) => v ?? null),
    setItem: (k, v: string) => set(k, v, deviceStore),
    removeItem: (k) => del(k, deviceStore),
  },
  key: QUERIES_KEY,
  throttleTime: 1000,
});

/** Kept answers older than this are not shown: a day covers a shift without the wi-fi. */
export const KEPT_FOR_MS = 24 * 3_600_000;

/** Forgets everything this device holds for whoever used it. */
export const forgetDevice = () => clear(deviceStore);

export const deviceGet = <T>(key: string) => get<T>(key, deviceStore);
export const deviceSet = (key: string, value: unknown) => set(key, value, deviceStore);
export const deviceDel = (key: string) => del(key, deviceStore);

/**
 * The answers a tablet needs when the wi-fi drops: who is signed in, the sites, the bikes and their
 * verdicts (the desk), the technician's tasks, valve cards and shim stock, the day's plan. The
 * manager's heavy planning and reporting answers are not written to the device.
 */
const KEPT_KINDS = new Set(['auth', 'sites', 'bikes', 'tasks', 'valves', 'stock', 'settings', 'models']);
const KEPT_PLAN = new Set(['my-day', 'next-visits']);
export const keptOffline = (key: readonly unknown[]) => KEPT_KINDS.has(String(key[0])) || (key[0] === 'plan' && KEPT_PLAN.has(String(key[1])));
