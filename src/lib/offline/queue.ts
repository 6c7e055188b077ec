import { useSyncExternalStore } from 'react';
import type { QueryClient } from '@tanstack/react-query';
import { api, ApiError } from '../api-client';
import { deviceGet, deviceSet } from './device-store';
import { newKey } from './key';

/**
 * Changes made without a connection wait here, on the device (IndexedDB), in the order they were
 * made, and are sent one by one when the connection is back. Each keeps its Idempotency-Key for
 * every try, so a change whose answer was lost is never applied twice; the server's own rules judge
 * each one when it arrives, and a refusal comes back to the person who made it.
 */
export interface QueuedChange {
  id: string;
  /** Who made it: only they see it and only their session sends it. */
  userId: string;
  method: 'POST' | 'PUT' | 'PATCH' | 'DELETE';
  url: string;
  body: unknown;
  /** In words, e.g. "Check-in of SM-07 at 12,480 km". */
  label: string;
  /** Where to put it right, e.g. the bike's check-in. */
  href?: string;
  madeAt: string;
  state: 'waiting' | 'refused';
  /** A file to send as multipart form data instead of a JSON body (a photo). */
  upload?: { fields: Record<string, string>; file: Blob; name: string };
  /** Photos taken offline with a check-in's defect: sent once the check-in has been taken. */
  photos?: { file: Blob; name: string }[];
  /** The server's reason, for a refused change, and its code (e.g. needs_confirmation). */
  problem?: string;
  code?: string;
}

export interface QueueState {
  changes: QueuedChange[];
  /** Sending stopped because the session ended: the same person must sign in again. */
  needsSignIn: boolean;
  sending: boolean;
  lastSentAt: string | null;
}

const QUEUE_KEY = 'lashline.queue';
let state: QueueState = { changes: [], needsSignIn: false, sending: false, lastSentAt: null };
const listeners = new Set<() => void>();
let loaded: Promise<void> | null = null;

function update(patch: Partial<QueueState>) {
  state = { ...state, ...patch };
  for (const l of listeners) l();
}

async function save(changes: QueuedChange[]) {
  update({ changes });
  await deviceSet(QUEUE_KEY, { changes, lastSentAt: state.lastSentAt });
}

/** Reads the queue kept on the device (once per page load). */
export function loadQueue() {
  loaded ??= deviceGet<{ changes: QueuedChange[]; lastSentAt: string | null }>(QUEUE_KEY)
    .then((kept) => {
      // Changes queued while the page loaded come after the kept ones.
      if (kept) update({ changes: [...kept.changes, ...state.changes.filter((c) => !kept.changes.some((k) => k.id === c.id))], lastSentAt: kept.lastSentAt });
    })
    .catch(() => undefined);
  return loaded;
}

export function useQueue(): QueueState {
  return useSyncExternalStore(
    (l) => {
      listeners.add(l);
      return () => listeners.delete(l);
    },
    () => state,
    () => state,
  );
}

export async function enqueue(change: Omit<QueuedChange, 'madeAt' | 'state'> & { madeAt?: string }) {
  await loadQueue();
  await save([...state.changes, { ...change, madeAt: change.madeAt ?? new Date().toISOString(), state: 'waiting' }]);
}

export async function dismiss(id: string) {
  await save(state.changes.filter((c) => c.id !== id));
}

/** A refused change sent again as a new change (e.g. once the reading is confirmed). */
export async function resend(id: string, body: unknown) {
  await save(state.changes.map((c) => (c.id === id ? { ...c, id: newKey(), body, state: 'waiting' as const, problem: undefined, code: undefined } : c)));
}

/** Photos taken with a change still waiting (a defect's): they go once the change has been taken. */
export async function attachPhotos(id: string, files: File[]) {
  await loadQueue();
  await save(state.changes.map((c) => (c.id === id ? { ...c, photos: [...(c.photos ?? []), ...files.map((f) => ({ file: f as Blob, name: f.name }))] } : c)));
}

/**
 * What follows a change once the server has taken it: each photo taken with a check-in becomes an
 * upload of its own to the bike, tied to the defect the check-in recorded.
 */
export function followUps(change: QueuedChange, answer: unknown): QueuedChange[] {
  if (!change.photos?.length) return [];
  const bikeId = /^\/api\/bikes\/([^/]+)\//.exec(change.url)?.[1];
  if (!bikeId) return [];
  const defectId = (answer as { defectId?: string | null } | null)?.defectId ?? null;
  const fields: Record<string, string> = defectId ? { defectId } : {};
  return change.photos.map((p, i) => ({
    id: newKey(), userId: change.userId, method: 'POST' as const, url: `/api/bikes/${bikeId}/attachments`, body: null,
    upload: { fields, file: p.file, name: p.name },
    label: `Photo ${i + 1} of ${change.photos!.length} for the ${change.label.charAt(0).toLowerCase()}${change.label.slice(1)}`,
    href: change.href, madeAt: change.madeAt, state: 'waiting' as const,
  }));
}

function bodyOf(c: QueuedChange) {
  if (!c.upload) return c.body;
  const form = new FormData();
  for (const [k, v] of Object.entries(c.upload.fields)) form.set(k, v);
  form.set('file', c.upload.file, c.upload.name);
  return form;
}

/** Drops one person's changes (signing out on a shared tablet). */
export async function dropChangesOf(userId: string) {
  await loadQueue();
  await save(state.changes.filter((c) => c.userId !== userId));
}

export const waitingOf = (s: QueueState, userId: string) => s.changes.filter((c) => c.userId === userId && c.state === 'waiting');

/** What the server's answer means for a queued change. */
export function outcomeOf(e: unknown): 'retry-later' | 'sign-in' | 'refused' {
  if (!(e instanceof ApiError)) return 'retry-later';
  if (e.code === 'network' || e.status >= 500 || e.status === 429 || e.code === 'in_progress') return 'retry-later';
  if (e.status === 401) return 'sign-in';
  return 'refused';
}

/**
 * Sends the person's waiting changes, oldest first, one at a time. Stops at the first that cannot
 * get through (no connection, the server busy, the session ended) and keeps it and those after it.
 */
export async function flush(userId: string, qc: QueryClient) {
  await loadQueue();
  if (state.sending || !navigator.onLine) return;
  update({ sending: true, needsSignIn: false });
  let sent = 0;
  try {
    for (;;) {
      const next = state.changes.find((c) => c.userId === userId && c.state === 'waiting');
      if (!next) break;
      try {
        const answer = await api.write(next.method, next.url, bodyOf(next), next.id);
        sent++;
        state = { ...state, lastSentAt: new Date().toISOString() };
        // Taken: it leaves the queue, and what follows from it (its photos) takes its place.
        await save(state.changes.flatMap((c) => (c.id === next.id ? followUps(next, answer) : [c])));
      } catch (e) {
        const o = outcomeOf(e);
        if (o === 'sign-in') update({ needsSignIn: true });
        if (o !== 'refused') break;
        const err = e as ApiError;
        await save(state.changes.map((c) => (c.id === next.id ? { ...c, state: 'refused' as const, problem: err.message, code: err.code } : c)));
      }
    }
  } finally {
    update({ sending: false });
    // What was sent moved the fleet: every answer on screen is read again.
    if (sent) void qc.invalidateQueries();
  }
}

export type WriteResult<T> = { queued: false; data: T } | { queued: true; id: string };

/**
 * A change that a tablet may make without the wi-fi: sent at once when there is a connection, or
 * kept on the device (with its key) when there is none or the connection fails on the way.
 */
export async function writeOrQueue<T>(
  change: { userId: string; method: QueuedChange['method']; url: string; body: unknown; label: string; href?: string },
  parse: (data: unknown) => T,
): Promise<WriteResult<T>> {
  const id = newKey();
  if (!navigator.onLine) {
    await enqueue({ ...change, id });
    return { queued: true, id };
  }
  try {
    return { queued: false, data: parse(await api.write(change.method, change.url, change.body, id)) };
  } catch (e) {
    if (e instanceof ApiError && e.code === 'network') {
      await enqueue({ ...change, id });
      return { queued: true, id };
    }
    throw e;
  }
}
