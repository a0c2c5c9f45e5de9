import { useSyncExternalStore } from 'react';

/** A small store of passing messages (background refresh failures, saved changes). */
export type ToastTone = 'ok' | 'info' | 'critical';
export interface Toast {
  id: number;
  tone: ToastTone;
  message: string;
}

let toasts: Toast[] = [];
let nextId = 1;
const listeners = new Set<() => void>();

function emit(): void {
  for (const l of listeners) l();
}

export function dismissToast(id: number): void {
  toasts = toasts.filter((t) => t.id !== id);
  emit();
}

function push(tone: ToastTone, message: string, ms: number): void {
  // the same message twice in a row (a refetch failing on every focus) shows once
  if (toasts.some((t) => t.message === message)) return;
  const id = nextId++;
  toasts = [...toasts.slice(-3), { id, tone, message }];
  emit();
  setTimeout(() => dismissToast(id), ms);
}

export const toast = {
  ok: (message: string) => push('ok', message, 4000),
  info: (message: string) => push('info', message, 5000),
  error: (message: string) => push('critical', message, 8000),
};

export function useToasts(): Toast[] {
  return useSyncExternalStore(
    (l) => {
      listeners.add(l);
      return () => listeners.delete(l);
    },
    () => toasts,
    () => toasts,
  );
}
