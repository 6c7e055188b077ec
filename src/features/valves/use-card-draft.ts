import { useCallback, useEffect, useRef, useState } from 'react';
import type { ValveCard } from '../../../shared/schemas/valves';
import { saveValveDraft } from './api';
import { openDraft, readLocal, removeLocal, toServerDraft, writeLocal, type CardDraft } from './card-draft';

export type SyncState = { kind: 'idle' } | { kind: 'saving' } | { kind: 'saved'; at: string } | { kind: 'failed'; message: string };

const SAVE_AFTER_MS = 1500;

/**
 * The card's state, written to this device at every change and to Lashline a moment after
 * typing stops, when the screen locks or the connection comes back.
 */
export function useCardDraft(card: ValveCard) {
  const taskId = card.task.id;
  const [opened] = useState(() => openDraft(card, readLocal(taskId)));
  const [draft, setDraft] = useState(opened.draft);
  const [sync, setSync] = useState<SyncState>({ kind: 'idle' });
  const touched = useRef(false);
  const unsent = useRef(opened.serverBehind);
  const latest = useRef(draft);
  const cardRef = useRef(card);
  const open = card.task.status === 'open' || card.task.status === 'in_progress';

  useEffect(() => {
    latest.current = draft;
    cardRef.current = card;
  });

  const update = useCallback((fn: (d: CardDraft) => CardDraft) => {
    touched.current = true;
    unsent.current = true;
    setDraft((d) => ({ ...fn(d), savedAt: new Date().toISOString() }));
  }, []);

  const push = useCallback(
    async (keepalive = false) => {
      if (!unsent.current || !open) return;
      const d = latest.current;
      setSync({ kind: 'saving' });
      try {
        await saveValveDraft(taskId, toServerDraft(d, cardRef.current), keepalive);
        if (latest.current.savedAt === d.savedAt) unsent.current = false;
        setSync({ kind: 'saved', at: d.savedAt });
      } catch (e) {
        setSync({ kind: 'failed', message: (e as Error).message });
      }
    },
    [taskId, open],
  );

  useEffect(() => {
    if (touched.current) writeLocal(taskId, draft);
    if (!unsent.current) return;
    const t = setTimeout(() => void push(), SAVE_AFTER_MS);
    return () => clearTimeout(t);
  }, [taskId, draft, push]);

  useEffect(() => {
    const onHide = () => {
      if (document.visibilityState === 'hidden') void push(true);
    };
    const onOnline = () => void push();
    document.addEventListener('visibilitychange', onHide);
    window.addEventListener('online', onOnline);
    return () => {
      document.removeEventListener('visibilitychange', onHide);
      window.removeEventListener('online', onOnline);
    };
  }, [push]);

  /** Forgets the device copy once the card is signed off (the server clears its own). */
  const clear = useCallback(() => {
    touched.current = false;
    unsent.current = false;
    removeLocal(taskId);
  }, [taskId]);

  return { draft, update, sync, clear, restoredFrom: opened.source };
}
