/**
 * Undo and redo for the editor: a plain reducer over immutable snapshots of the document.
 *
 * Typing into one field makes one step, not one per keystroke: an edit with the same
 * `key` as the previous one, within COALESCE_MS, replaces the present instead of pushing.
 * Undo and redo always end a run of coalesced edits.
 */
export const COALESCE_MS = 1200;
export const HISTORY_LIMIT = 200;

export interface History<T> {
  past: T[];
  present: T;
  future: T[];
  /** coalescing key and time of the last edit, null after undo/redo/reset */
  lastKey: string | null;
  lastAt: number;
}

export type HistoryAction<T> =
  { type: "edit"; next: T; key?: string; at?: number } | { type: "undo" } | { type: "redo" } | { type: "reset"; present: T };

export function createHistory<T>(present: T): History<T> {
  return { past: [], present, future: [], lastKey: null, lastAt: 0 };
}

export function historyReducer<T>(h: History<T>, action: HistoryAction<T>): History<T> {
  switch (action.type) {
    case "edit": {
      if (Object.is(action.next, h.present)) return h;
      const at = action.at ?? Date.now();
      const key = action.key ?? null;
      if (key !== null && key === h.lastKey && at - h.lastAt < COALESCE_MS) {
        return { ...h, present: action.next, future: [], lastAt: at };
      }
      const past =
        h.past.length >= HISTORY_LIMIT ? [...h.past.slice(h.past.length - HISTORY_LIMIT + 1), h.present] : [...h.past, h.present];
      return { past, present: action.next, future: [], lastKey: key, lastAt: at };
    }
    case "undo": {
      if (h.past.length === 0) return h;
      const previous = h.past[h.past.length - 1];
      return { past: h.past.slice(0, -1), present: previous, future: [h.present, ...h.future], lastKey: null, lastAt: 0 };
    }
    case "redo": {
      if (h.future.length === 0) return h;
      const [next, ...rest] = h.future;
      return { past: [...h.past, h.present], present: next, future: rest, lastKey: null, lastAt: 0 };
    }
    case "reset":
      return createHistory(action.present);
  }
}

export const canUndo = (h: History<unknown>) => h.past.length > 0;
export const canRedo = (h: History<unknown>) => h.future.length > 0;
