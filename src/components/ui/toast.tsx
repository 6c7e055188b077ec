import { useSyncExternalStore } from 'react';

type Toast = { id: number; text: string };
let items: Toast[] = [];
const listeners = new Set<() => void>();
let next = 1;

export function toast(text: string) {
  const id = next++;
  items = [...items, { id, text }];
  listeners.forEach((l) => l());
  setTimeout(() => {
    items = items.filter((t) => t.id !== id);
    listeners.forEach((l) => l());
  }, 6000);
}

const subscribe = (l: () => void) => {
  listeners.add(l);
  return () => listeners.delete(l);
};

export function Toaster() {
  const list = useSyncExternalStore(subscribe, () => items, () => items);
  return (
    <div aria-live="polite" className="fixed bottom-4 right-4 z-50 flex flex-col gap-2">
      {list.map((t) => (
        <div key={t.id} className="rounded-card bg-ink px-4 py-3 text-paper shadow-lg">
          {t.text}
        </div>
      ))}
    </div>
  );
}
