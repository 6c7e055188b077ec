import { useCallback, useEffect, useRef, useState } from 'react';

const PREFIX = 'lashline.draft.';

function read<T>(key: string, initial: T): T {
  try {
    const raw = localStorage.getItem(PREFIX + key);
    return raw ? { ...initial, ...(JSON.parse(raw) as Partial<T>) } : initial;
  } catch {
    return initial;
  }
}

/**
 * Form state kept on this device as it is typed, so a reload, a locked screen or a dropped
 * connection loses nothing. `clear` forgets it once the server has accepted the form.
 */
export function useDraft<T extends object>(key: string, initial: T) {
  const blank = useRef(initial);
  const [value, setValue] = useState<T>(() => read(key, initial));
  const [loadedKey, setLoadedKey] = useState(key);
  // A different record (another bike, another task) has its own draft.
  if (loadedKey !== key) {
    setLoadedKey(key);
    setValue(read(key, blank.current));
  }
  useEffect(() => {
    try {
      // An untouched form leaves nothing behind on the device.
      if (JSON.stringify(value) === JSON.stringify(blank.current)) localStorage.removeItem(PREFIX + key);
      else localStorage.setItem(PREFIX + key, JSON.stringify(value));
    } catch {
      // Storage full or blocked (private mode): the form still works, only without the safety net.
    }
  }, [key, value]);
  // Removed at once: the form often unmounts in the same render (a verdict replaces it).
  const clear = useCallback(() => {
    try {
      localStorage.removeItem(PREFIX + key);
    } catch {
      // Blocked storage held nothing to forget.
    }
    setValue(blank.current);
  }, [key]);
  return [value, setValue, clear] as const;
}

/** Whether something typed for this key is waiting on the device (to reopen a half-filled form). */
export function hasDraft(key: string) {
  try {
    return localStorage.getItem(PREFIX + key) !== null;
  } catch {
    return false;
  }
}

const draftKeys = () => Array.from({ length: localStorage.length }, (_, i) => localStorage.key(i)).filter((k): k is string => !!k?.startsWith(PREFIX));

/** How many unsaved forms this device holds (check-ins, sign-offs, valve cards). */
export const draftCount = () => draftKeys().length;

/** Forgets every unsaved form on this device (signing out of a shared tablet). */
export function forgetDrafts() {
  for (const k of draftKeys()) localStorage.removeItem(k);
}
