/**
 * What every part of the editor reads and how it changes the document: one context, so
 * the tree, the form, the tables and the estimate stay in step without prop chains.
 */
import { createContext, useContext } from "react";
import type { IssueIndex, LocalIssue } from "../lib/issues";
import type { EditorDoc, Path } from "../lib/stack-ops";

export interface EditorApi {
  doc: EditorDoc;
  readOnly: boolean;
  issues: IssueIndex;
  /** a new document from the current one; edits with the same key in a row make one undo step */
  update: (fn: (doc: EditorDoc) => EditorDoc, key?: string) => void;
  /** one value at a path of the document; `undefined` removes it */
  setAt: (path: Path, value: unknown, key?: string) => void;
  selectedId: string | null;
  select: (id: string | null) => void;
  /** names of the workspace's supplier companies, for tolerance owners */
  suppliers: string[];
  /** geometry warnings (overhang, overlap, clearance, body height) by element index; they do not block saving */
  warnings: Map<number, LocalIssue[]>;
}

export const EditorContext = createContext<EditorApi | null>(null);

export function useEditor(): EditorApi {
  const api = useContext(EditorContext);
  if (!api) throw new Error("useEditor outside the stack editor");
  return api;
}
