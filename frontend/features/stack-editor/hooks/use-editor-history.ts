import { useCallback, useReducer } from "react";
import { createHistory, historyReducer, type History, type HistoryAction } from "../lib/history";
import { setAt as setPath, type EditorDoc, type Path } from "../lib/stack-ops";

type Action = HistoryAction<EditorDoc> | { type: "update"; fn: (doc: EditorDoc) => EditorDoc; key?: string; at: number };

function reducer(h: History<EditorDoc>, a: Action): History<EditorDoc> {
  if (a.type === "update") return historyReducer(h, { type: "edit", next: a.fn(h.present), key: a.key, at: a.at });
  return historyReducer(h, a);
}

/** The document with its undo history; edits are functions of the current document. */
export function useEditorHistory(initial: EditorDoc) {
  const [history, dispatch] = useReducer(reducer, initial, createHistory);
  const update = useCallback(
    (fn: (doc: EditorDoc) => EditorDoc, key?: string) => dispatch({ type: "update", fn, key, at: Date.now() }),
    [],
  );
  const setAt = useCallback(
    (path: Path, value: unknown, key?: string) =>
      dispatch({ type: "update", fn: (d) => setPath(d, path, value), key: key ?? path.join("."), at: Date.now() }),
    [],
  );
  const undo = useCallback(() => dispatch({ type: "undo" }), []);
  const redo = useCallback(() => dispatch({ type: "redo" }), []);
  const reset = useCallback((present: EditorDoc) => dispatch({ type: "reset", present }), []);
  return { history, doc: history.present, update, setAt, undo, redo, reset };
}
