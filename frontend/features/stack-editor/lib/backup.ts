/**
 * A copy of unsaved work in this browser's storage, per revision, until the server has
 * it: a closed tab, a lost connection or a refused save does not lose the edits.
 */
import type { EditorDoc } from "./stack-ops";

export interface Backup {
  doc: EditorDoc;
  /** updatedAt of the revision the edits started from */
  basedOn: string;
  at: string;
}

const key = (revisionId: string) => `orthostack.unsaved.${revisionId}`;

export function writeBackup(revisionId: string, backup: Backup) {
  try {
    localStorage.setItem(key(revisionId), JSON.stringify(backup));
  } catch {
    // storage full or blocked: the autosave still runs
  }
}

export function readBackup(revisionId: string): Backup | null {
  try {
    const raw = localStorage.getItem(key(revisionId));
    if (!raw) return null;
    const b = JSON.parse(raw) as Backup;
    return b && typeof b === "object" && b.doc && Array.isArray(b.doc.stack?.elements) ? b : null;
  } catch {
    return null;
  }
}

export function clearBackup(revisionId: string) {
  try {
    localStorage.removeItem(key(revisionId));
  } catch {
    // nothing to clear
  }
}
