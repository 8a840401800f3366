/**
 * Undo/redo of editor documents: immutable snapshots. Typing into one field makes one step, not
 * one per keystroke: a commit with the same `key` within `coalesceMs` of the previous one
 * replaces the newest step instead of adding another.
 */
export interface History<T> {
  readonly past: readonly T[];
  readonly present: T;
  readonly future: readonly T[];
  readonly lastKey?: string;
  readonly lastAt?: number;
}

export const HISTORY_LIMIT = 200;
export const COALESCE_MS = 1200;

export function startHistory<T>(present: T): History<T> {
  return { past: [], present, future: [] };
}

export function commit<T>(h: History<T>, next: T, opts: { key?: string; at?: number; coalesceMs?: number } = {}): History<T> {
  if (next === h.present) return h;
  const at = opts.at ?? Date.now();
  const window = opts.coalesceMs ?? COALESCE_MS;
  const coalesce = opts.key !== undefined && opts.key === h.lastKey && h.lastAt !== undefined && at - h.lastAt <= window && h.past.length > 0;
  const past = coalesce ? h.past : [...h.past, h.present].slice(-HISTORY_LIMIT);
  return { past, present: next, future: [], lastKey: opts.key, lastAt: at };
}

export function undo<T>(h: History<T>): History<T> {
  if (h.past.length === 0) return h;
  return { past: h.past.slice(0, -1), present: h.past[h.past.length - 1]!, future: [h.present, ...h.future] };
}

export function redo<T>(h: History<T>): History<T> {
  if (h.future.length === 0) return h;
  return { past: [...h.past, h.present], present: h.future[0]!, future: h.future.slice(1) };
}

export const canUndo = (h: History<unknown>): boolean => h.past.length > 0;
export const canRedo = (h: History<unknown>): boolean => h.future.length > 0;
