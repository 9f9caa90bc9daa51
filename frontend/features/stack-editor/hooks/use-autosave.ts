/**
 * Saves a draft by itself: a PATCH ~800 ms after the last change, one request at a time,
 * and again at once if the document changed while a save was on its way. A document the
 * validator refuses is not sent (the server would refuse it too); the editor shows its
 * problems instead. A copy of unsaved work is kept in this browser until the server has it.
 *
 * Every save names the version of the draft it was made on. When someone else saved the draft
 * meanwhile, the server refuses (409 `conflict`): saving stops, the edits stay, and the editor
 * offers to reload the draft and reapply them (`rebase`) or to drop them.
 */
import { useCallback, useEffect, useRef, useState } from "react";
import { isApiError, type FieldError } from "@frontend/lib/api-client";
import { useUpdateRevision } from "@frontend/features/revisions";
import type { EditorDoc } from "../lib/stack-ops";
import { clearBackup, writeBackup } from "../lib/backup";

export const AUTOSAVE_DEBOUNCE_MS = 800;
export const RETRY_MS = 5000;

export type SaveState =
  | { kind: "saved"; at: Date | null; /** saves made in this visit */ saves: number }
  | { kind: "pending" }
  | { kind: "saving" }
  | { kind: "invalid"; count: number }
  | { kind: "error"; message: string; fields: FieldError[]; retryable: boolean }
  /** someone else saved the draft since it was loaded: `version` is theirs */
  | { kind: "conflict"; message: string; version: number | undefined };

export function useAutosave({
  revisionId,
  doc,
  savedDoc,
  enabled,
  problems,
  updatedAt,
  version: loadedVersion,
}: {
  revisionId: string;
  doc: EditorDoc;
  /** the document as loaded from the server */
  savedDoc: EditorDoc;
  enabled: boolean;
  /** problems the validator found in `doc` */
  problems: number;
  updatedAt: string;
  /** the version of the draft as loaded; each save sends the version it was made on */
  version: number;
}) {
  const mutation = useUpdateRevision();
  const mutate = mutation.mutateAsync;
  const saved = useRef<EditorDoc>(savedDoc);
  const current = useRef(doc);
  current.current = doc;
  const inFlight = useRef<Promise<boolean> | null>(null);
  const timer = useRef<number | null>(null);
  const frozen = useRef(false);
  // Only a copy written in this visit is ours to drop when the document is back to saved.
  const wroteBackup = useRef(false);
  const saves = useRef(0);
  const version = useRef(loadedVersion);
  // bumped by `rebase`, so the save schedule looks at the document again
  const [base, setBase] = useState(0);
  const [state, setState] = useState<SaveState>(() => ({ kind: "saved", at: new Date(updatedAt), saves: 0 }));
  const [dirty, setDirty] = useState(false);

  const save = useCallback(async (): Promise<boolean> => {
    // One save at a time: two callers waiting on the same save (the debounce timer and the
    // "edits made meanwhile" follow-up) must not both start one on the same version, or the
    // second is refused as a conflict with ourselves. Whoever wakes second waits for the first's.
    while (inFlight.current) await inFlight.current;
    const sending = current.current;
    if (sending === saved.current) return true;
    if (frozen.current) return false;
    setState({ kind: "saving" });
    const run = (async () => {
      try {
        const revision = await mutate({
          id: revisionId,
          version: version.current,
          changes: { stack: sending.stack, requirements: sending.requirements },
        });
        version.current = revision.version;
        saved.current = sending;
        saves.current++;
        if (current.current === sending) {
          clearBackup(revisionId);
          setDirty(false);
          setState({ kind: "saved", at: new Date(), saves: saves.current });
        }
        return true;
      } catch (error) {
        const e = isApiError(error) ? error : null;
        if (e?.code === "revision_frozen" || e?.status === 409) frozen.current = true;
        if (e?.code === "conflict") {
          setState({ kind: "conflict", message: e.message, version: e.version });
          return false;
        }
        const retryable = !frozen.current && (!e || e.status === 0 || e.status >= 500);
        setState({ kind: "error", message: e?.message ?? "The draft could not be saved.", fields: e?.fields ?? [], retryable });
        // A lost connection or a server hiccup: try again by itself (the browser copy holds the edits meanwhile).
        if (retryable) {
          if (timer.current) window.clearTimeout(timer.current);
          timer.current = window.setTimeout(() => void saveRef.current(), RETRY_MS);
        }
        return false;
      } finally {
        inFlight.current = null;
      }
    })();
    inFlight.current = run;
    const ok = await run;
    // Edits made while this save travelled go out next.
    if (ok && current.current !== saved.current && enabled) return save();
    return ok;
  }, [enabled, mutate, revisionId]);
  const saveRef = useRef(save);
  saveRef.current = save;

  useEffect(() => {
    if (timer.current) window.clearTimeout(timer.current);
    if (!enabled) return;
    const isDirty = doc !== saved.current;
    setDirty(isDirty);
    if (!isDirty) {
      if (wroteBackup.current) clearBackup(revisionId);
      // a conflict stays on screen until it is resolved (rebase): the server's draft is not ours
      setState((s) =>
        s.kind === "saved" || s.kind === "conflict"
          ? s
          : { kind: "saved", at: s.kind === "error" ? null : new Date(), saves: saves.current },
      );
      return;
    }
    writeBackup(revisionId, { doc, basedOn: updatedAt, at: new Date().toISOString() });
    wroteBackup.current = true;
    if (problems > 0) {
      setState((s) => (s.kind === "conflict" ? s : { kind: "invalid", count: problems }));
      return;
    }
    if (frozen.current) return;
    setState((s) => (s.kind === "saving" ? s : { kind: "pending" }));
    timer.current = window.setTimeout(() => void save(), AUTOSAVE_DEBOUNCE_MS);
    return () => {
      if (timer.current) window.clearTimeout(timer.current);
    };
  }, [doc, enabled, problems, revisionId, save, updatedAt, base]);

  /** Save now (before submitting, before leaving); resolves true when the server has it all. */
  const flush = useCallback(async () => {
    if (timer.current) window.clearTimeout(timer.current);
    if (current.current === saved.current) return true;
    if (problems > 0) return false;
    return save();
  }, [problems, save]);

  /**
   * The draft as the server has it now (`doc` at `at`), after a conflict or after an action of
   * our own (submit) moved its version: saves go on from there; what differs is saved next.
   */
  const rebase = useCallback((doc: EditorDoc, at: number) => {
    saved.current = doc;
    version.current = at;
    frozen.current = false;
    setState({ kind: "saved", at: new Date(), saves: saves.current });
    setBase((n) => n + 1);
  }, []);
  /** The version the next change of this draft is made on. */
  const currentVersion = useCallback(() => version.current, []);
  /** The document the server has, as far as this page knows. */
  const serverDoc = useCallback(() => saved.current, []);

  return {
    state,
    dirty,
    flush,
    retry: save,
    rebase,
    version: currentVersion,
    serverDoc,
    saves: state.kind === "saved" ? state.saves : saves.current,
  };
}
