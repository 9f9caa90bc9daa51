/**
 * The stack editor: element tree, the selected element's form and the 3D view side by
 * side, the live estimate above them, the table of every tolerance source and the
 * requirements below. Drafts save themselves; approved and in-review revisions open
 * read-only.
 */
import { useCallback, useEffect, useMemo, useRef, useState, type ReactNode, type Ref } from "react";
import { Link, useBlocker, useNavigate } from "react-router";
import type { Me, Project } from "@shared/schemas/api";
import type { Revision } from "@shared/schemas/revisions";
import { validateStackFile } from "@shared/schemas/stack-file";
import { geometryWarnings } from "@shared/stack-geometry";
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { ConfirmDialog } from "@frontend/components/ui/confirm-dialog";
import { ChevronLeftIcon } from "@frontend/components/ui/icons";
import { ArchivedProjectNotice } from "@frontend/features/projects";
import { useSuppliers } from "@frontend/features/suppliers";
import { RevisionStatusChip, useLatestRevision } from "@frontend/features/revisions";
import { isApiError } from "@frontend/lib/api-client";
import { cn } from "@frontend/lib/cn";
import { formatDateTime } from "@frontend/lib/format";
import { can } from "@frontend/lib/permissions";
import { useAutosave } from "../hooks/use-autosave";
import { useEditorHistory } from "../hooks/use-editor-history";
import { useLiveEstimate } from "../hooks/use-live-estimate";
import { clearBackup, readBackup, type Backup } from "../lib/backup";
import { canRedo, canUndo } from "../lib/history";
import { fromServerFields, indexIssues, validateDoc } from "../lib/issues";
import { reapply } from "../lib/reapply";
import type { EditorDoc } from "../lib/stack-ops";
import { ConflictNotice, ReappliedNotice, type Reapplied } from "./conflict-notice";
import { EditorContext, type EditorApi } from "./editor-context";
import { ElementForm } from "./element-form";
import { ElementTree } from "./element-tree";
import { TextInput } from "./fields";
import { LiveEstimateStrip } from "./live-estimate-strip";
import { ProblemList } from "./problem-list";
import { RequirementsEditor } from "./requirements-editor";
import { ReviewActions, ReviewNotes } from "./review-panel";
import { SaveStatus } from "./save-status";
import { StackDrawing } from "./stack-drawing";
import { StackFileActions } from "./stack-file-actions";
import { ToleranceTable } from "./tolerance-table";
import { ViewerPanel } from "./viewer-panel";

function docOf(revision: Revision): EditorDoc {
  return { stack: revision.stack, requirements: revision.requirements };
}

const UndoIcon = () => (
  <svg
    width="15"
    height="15"
    viewBox="0 0 16 16"
    fill="none"
    stroke="currentColor"
    strokeWidth="1.5"
    strokeLinecap="round"
    strokeLinejoin="round"
    aria-hidden="true"
  >
    <path d="M5.5 3 2.5 6l3 3" />
    <path d="M2.5 6h7a4 4 0 0 1 0 8H7" />
  </svg>
);
const RedoIcon = () => (
  <svg
    width="15"
    height="15"
    viewBox="0 0 16 16"
    fill="none"
    stroke="currentColor"
    strokeWidth="1.5"
    strokeLinecap="round"
    strokeLinejoin="round"
    aria-hidden="true"
  >
    <path d="m10.5 3 3 3-3 3" />
    <path d="M13.5 6h-7a4 4 0 0 0 0 8H9" />
  </svg>
);

function Card({
  title,
  meta,
  actions,
  children,
  className,
  bodyClassName,
  bodyRef,
}: {
  title: ReactNode;
  meta?: ReactNode;
  actions?: ReactNode;
  children: ReactNode;
  className?: string;
  bodyClassName?: string;
  bodyRef?: Ref<HTMLDivElement>;
}) {
  return (
    <section
      className={cn("flex min-h-0 flex-col rounded-lg border border-line bg-panel shadow-[0_1px_2px_rgba(23,33,43,0.04)]", className)}
    >
      <header className="flex min-h-10 shrink-0 items-center justify-between gap-2 border-b border-line px-3.5 py-1.5">
        <div className="flex min-w-0 items-baseline gap-2">
          <h2 className="text-[13px] font-bold text-ink">{title}</h2>
          {meta ? <span className="truncate text-[11px] text-ink/50">{meta}</span> : null}
        </div>
        {actions ? <div className="flex shrink-0 items-center gap-1">{actions}</div> : null}
      </header>
      <div ref={bodyRef} className={cn("min-h-0 flex-1", bodyClassName)}>
        {children}
      </div>
    </section>
  );
}

export function StackEditor({
  revision,
  project,
  me,
}: {
  revision: Revision;
  project: Pick<Project, "id" | "name"> & Partial<Pick<Project, "archivedAt">>;
  me: Me;
}) {
  const initial = useMemo(() => docOf(revision), [revision.id]); // eslint-disable-line react-hooks/exhaustive-deps
  const { history, doc, update, setAt, undo, redo, reset } = useEditorHistory(initial);
  const canWrite = can(me.role, "revisions.write");
  // an archived project is read-only: the server refuses every change under it
  const archived = !!project.archivedAt;
  const editable = revision.status === "draft" && canWrite && !archived;
  const readOnly = !editable;
  const navigate = useNavigate();

  // A copy of edits that never reached the server (closed tab, refused save).
  const [backup, setBackup] = useState<Backup | null>(() => {
    if (!editable) return null;
    const b = readBackup(revision.id);
    return b && JSON.stringify(b.doc) !== JSON.stringify(initial) ? b : null;
  });

  const [selectedId, setSelectedId] = useState<string | null>(() => initial.stack.elements?.[0]?.id ?? null);
  const select = useCallback((id: string | null) => setSelectedId(id), []);

  const stackValidation = useMemo(() => validateStackFile(doc.stack), [doc.stack]);
  const stackValid = stackValidation.ok;
  const localIssues = useMemo(() => validateDoc(doc, stackValidation), [doc, stackValidation]);
  const autosave = useAutosave({
    revisionId: revision.id,
    doc,
    savedDoc: initial,
    enabled: editable,
    problems: localIssues.length,
    updatedAt: revision.updatedAt,
    version: useMemo(() => revision.version, [revision.id]), // eslint-disable-line react-hooks/exhaustive-deps
  });
  const saveState = autosave.state;

  // Someone else saved the draft meanwhile: reload it and lay this engineer's edits over it, or drop them.
  const latestRevision = useLatestRevision();
  const [resolving, setResolving] = useState<"reapply" | "discard" | null>(null);
  const [resolveError, setResolveError] = useState<string | null>(null);
  const [reapplied, setReapplied] = useState<Reapplied | null>(null);
  const { rebase, serverDoc } = autosave;
  // the document at the moment the reload comes back (edits made while it travelled included)
  const docRef = useRef(doc);
  docRef.current = doc;
  const resolveConflict = useCallback(
    async (keep: boolean) => {
      setResolving(keep ? "reapply" : "discard");
      setResolveError(null);
      try {
        const fresh = await latestRevision(revision.id);
        if (fresh.status !== "draft") {
          setResolveError(
            `Revision ${fresh.number} is no longer a draft, so it cannot take your edits. They stay in this browser: start a new draft and restore them there.`,
          );
          return;
        }
        const theirs = docOf(fresh);
        const merged = keep ? reapply(serverDoc(), docRef.current, theirs) : null;
        rebase(theirs, fresh.version);
        // their version first, so undo shows it without these edits
        reset(theirs);
        if (merged) {
          update(() => merged.doc, "reapply");
          setReapplied({ version: fresh.version, overlaps: merged.overlaps });
        } else {
          clearBackup(revision.id);
        }
      } catch (e) {
        setResolveError(isApiError(e) ? e.message : "The draft could not be loaded. Try again.");
      } finally {
        setResolving(null);
      }
    },
    [latestRevision, rebase, reset, revision.id, serverDoc, update],
  );
  const issues = useMemo(() => {
    const serverIssues = saveState.kind === "error" ? fromServerFields(saveState.fields) : [];
    return indexIssues([...localIssues, ...serverIssues.filter((s) => !localIssues.some((l) => l.path === s.path))]);
  }, [localIssues, saveState]);

  const estimate = useLiveEstimate(doc.stack, doc.requirements, stackValid);
  const suppliersQuery = useSuppliers();
  const suppliers = useMemo(() => (suppliersQuery.data ?? []).map((s) => s.name).sort((a, b) => a.localeCompare(b)), [suppliersQuery.data]);

  // The selection follows the document: an undone "add" or a removal leaves no stale id.
  const selectedIndex = doc.stack.elements.findIndex((e) => e.id === selectedId);
  useEffect(() => {
    if (selectedIndex < 0 && doc.stack.elements.length) setSelectedId(doc.stack.elements[0].id);
  }, [selectedIndex, doc.stack.elements]);

  const slips = useMemo(() => (stackValidation.ok ? geometryWarnings(stackValidation.stack) : []), [stackValidation]);
  const warnings = useMemo(() => indexIssues(slips).elements, [slips]);
  const flaggedIds = useMemo(() => [...warnings.keys()].flatMap((i) => doc.stack.elements[i]?.id ?? []), [warnings, doc.stack]);

  const api: EditorApi = useMemo(
    () => ({ doc, readOnly, issues, update, setAt, selectedId, select, suppliers, warnings }),
    [doc, readOnly, issues, update, setAt, selectedId, select, suppliers, warnings],
  );

  // Ctrl+Z, Ctrl+Shift+Z and Ctrl+Y act on the document, also from inside a field.
  useEffect(() => {
    if (readOnly) return;
    const onKey = (e: KeyboardEvent) => {
      if (!(e.ctrlKey || e.metaKey) || e.altKey) return;
      // A note being written keeps the browser's own text undo.
      if (e.target instanceof HTMLTextAreaElement) return;
      const k = e.key.toLowerCase();
      if (k === "z" && !e.shiftKey) {
        e.preventDefault();
        undo();
      } else if ((k === "z" && e.shiftKey) || k === "y") {
        e.preventDefault();
        redo();
      }
    };
    window.addEventListener("keydown", onKey, true);
    return () => window.removeEventListener("keydown", onKey, true);
  }, [readOnly, undo, redo]);

  // Leaving: save first when possible; warn when the server does not have the last edits.
  const mustWarn = editable && autosave.dirty;
  const blocker = useBlocker(({ currentLocation, nextLocation }) => mustWarn && currentLocation.pathname !== nextLocation.pathname);
  const [leaveDialog, setLeaveDialog] = useState(false);
  const flush = autosave.flush;
  // The blocker object is new on every render; read its live state when the save returns, so a
  // navigation that already went ahead is not told to proceed a second time.
  const blockerRef = useRef(blocker);
  blockerRef.current = blocker;
  useEffect(() => {
    if (blocker.state !== "blocked") return;
    let cancelled = false;
    void flush().then((ok) => {
      const live = blockerRef.current;
      if (cancelled || live.state !== "blocked") return;
      if (ok) live.proceed();
      else setLeaveDialog(true);
    });
    return () => {
      cancelled = true;
    };
  }, [blocker.state, flush]);
  useEffect(() => {
    if (!mustWarn) return;
    const onUnload = (e: BeforeUnloadEvent) => {
      e.preventDefault();
      e.returnValue = "";
    };
    window.addEventListener("beforeunload", onUnload);
    return () => window.removeEventListener("beforeunload", onUnload);
  }, [mustWarn]);

  const selectedEl = selectedIndex >= 0 ? selectedIndex : -1;
  // another element: its form starts at the top, not where the last one was scrolled to
  const formBody = useRef<HTMLDivElement>(null);
  useEffect(() => {
    if (formBody.current) formBody.current.scrollTop = 0;
  }, [selectedId]);
  const worstPicks = estimate.summary && !estimate.stale ? estimate.summary.worst : undefined;
  const problemCount = issues.count;

  return (
    <EditorContext.Provider value={api}>
      <div className="mb-2 flex items-center gap-1.5 text-xs font-semibold text-ink/55">
        <Link to={`/projects/${project.id}`} className="inline-flex items-center gap-1 hover:text-ink">
          <ChevronLeftIcon size={14} /> {project.name}
        </Link>
        <span className="text-ink/30">/</span>
        <span>Stack revision {revision.number}</span>
      </div>

      <div className="mb-3 flex flex-wrap items-center gap-x-4 gap-y-2">
        <div className="flex min-w-0 items-center gap-2.5">
          <h1 className="text-[20px] leading-7 font-extrabold tracking-[-0.015em] whitespace-nowrap text-ink">
            Revision {revision.number}
          </h1>
          <RevisionStatusChip status={revision.status} />
        </div>
        <label className="flex min-w-[min(100%,28rem)] flex-1 items-center gap-2">
          <span className="shrink-0 text-[11px] font-semibold text-ink/55">Stack name</span>
          <TextInput
            value={doc.stack.name ?? ""}
            disabled={readOnly}
            maxLength={200}
            placeholder="e.g. 9-axis module, LGA 3 × 3"
            onChange={(e) => setAt(["stack", "name"], e.target.value === "" ? undefined : e.target.value, "stack.name")}
            className="h-8 max-w-[440px] text-[13px] font-semibold"
          />
        </label>
        <div className="flex items-center gap-1.5">
          {editable ? <SaveStatus state={autosave.state} saves={autosave.saves} onRetry={() => void autosave.retry()} /> : null}
          {editable ? (
            <div className="flex items-center rounded-md border border-line bg-panel">
              <button
                type="button"
                onClick={undo}
                disabled={!canUndo(history)}
                aria-label="Undo"
                title="Undo (Ctrl+Z)"
                className="flex size-8 items-center justify-center rounded-l-md text-ink/70 hover:bg-ink/[0.05] hover:text-ink disabled:opacity-35"
              >
                <UndoIcon />
              </button>
              <span className="h-5 w-px bg-line" aria-hidden="true" />
              <button
                type="button"
                onClick={redo}
                disabled={!canRedo(history)}
                aria-label="Redo"
                title="Redo (Ctrl+Shift+Z)"
                className="flex size-8 items-center justify-center rounded-r-md text-ink/70 hover:bg-ink/[0.05] hover:text-ink disabled:opacity-35"
              >
                <RedoIcon />
              </button>
            </div>
          ) : null}
          <StackFileActions revision={revision} readOnly={readOnly} />
          {archived ? null : (
            <ReviewActions
              revision={revision}
              me={me}
              flush={autosave.flush}
              version={autosave.version}
              onMoved={(moved) => rebase(serverDoc(), moved.version)}
              problems={problemCount}
              onDraft={(id) => navigate(`/projects/${project.id}/revisions/${id}`)}
            />
          )}
        </div>
      </div>

      {archived ? (
        <ArchivedProjectNotice project={project} toDo="edit, submit or review this revision" className="mb-3" />
      ) : revision.status !== "draft" ? (
        <div role="status" className="mb-3 flex flex-wrap items-center gap-3 rounded-lg border border-ink/15 bg-ink px-4 py-2.5 text-paper">
          <span className="text-[13px] font-bold">
            {revision.status === "approved"
              ? `Approved${revision.approvedByName ? ` by ${revision.approvedByName}` : ""}${revision.approvedAt ? ` on ${formatDateTime(revision.approvedAt)}` : ""}: frozen.`
              : `In review since ${revision.submittedAt ? formatDateTime(revision.submittedAt) : "—"}: read only.`}
          </span>
          <span className="text-[13px] text-paper/70">
            {revision.status === "approved"
              ? "Studies and reports refer to exactly this content. Changes go into a new draft revision."
              : "A reviewer approves it or sends it back with a comment; changes go into a new draft."}
          </span>
        </div>
      ) : !canWrite ? (
        <Alert tone="info" className="mb-3" title="Draft, read only for your role">
          Engineers edit drafts. You can read it and leave review notes; approval comes once it is submitted.
        </Alert>
      ) : null}

      {editable && saveState.kind === "conflict" ? (
        <ConflictNotice
          message={saveState.message}
          version={saveState.version}
          pending={resolving}
          error={resolveError}
          onReapply={() => void resolveConflict(true)}
          onDiscard={() => void resolveConflict(false)}
        />
      ) : null}
      {reapplied && saveState.kind !== "conflict" ? <ReappliedNotice reapplied={reapplied} onClose={() => setReapplied(null)} /> : null}

      {backup ? (
        <Alert tone="info" className="mb-3" title="Unsaved edits were found in this browser">
          <div className="flex flex-wrap items-center gap-2">
            <span>
              From {formatDateTime(backup.at)}
              {backup.basedOn !== revision.updatedAt ? "; the draft has changed on the server since." : "."}
            </span>
            <Button
              size="sm"
              variant="primary"
              onClick={() => {
                const restored = backup.doc;
                update(() => restored, "restore");
                setBackup(null);
              }}
            >
              Restore them
            </Button>
            <Button
              size="sm"
              variant="ghost"
              onClick={() => {
                clearBackup(revision.id);
                setBackup(null);
              }}
            >
              Discard
            </Button>
          </div>
        </Alert>
      ) : null}

      {problemCount > 0 ? <ProblemList issues={issues} doc={doc} onSelect={select} saving={editable} /> : null}

      <LiveEstimateStrip estimate={estimate} problems={stackValidation.ok ? 0 : stackValidation.issues.length} />

      <div className="mt-3 grid gap-3 xl:h-[700px] xl:grid-cols-[224px_minmax(350px,0.9fr)_minmax(0,1.25fr)]">
        <Card title="Elements" meta={`${doc.stack.elements.length}`} className="max-xl:h-[360px]">
          <ElementTree />
        </Card>
        <Card title="Selected element" className="max-xl:max-h-[640px]" bodyClassName="overflow-y-auto" bodyRef={formBody}>
          {selectedEl >= 0 ? (
            <ElementForm index={selectedEl} />
          ) : (
            <p className="p-4 text-[13px] text-ink/55">Select an element in the tree.</p>
          )}
        </Card>
        <ViewerPanel
          stack={doc.stack}
          study={estimate.basis?.study}
          worstTrials={worstPicks?.map((w) => ({
            metric: w.metric,
            trialIndex: w.trialIndex,
            value: w.value,
            unit: w.unit === "deg" ? "°" : "%",
          }))}
          selectedId={selectedId}
          onSelect={select}
          flaggedIds={flaggedIds}
          revisionLabel={`revision ${revision.number}`}
        />
      </div>

      <Card title="Drawing" meta="top view and side section at the nominal sizes, dimensioned" className="mt-3">
        <StackDrawing stack={stackValidation.ok ? stackValidation.stack : null} revisionNumber={revision.number} />
      </Card>

      <Card
        title="Tolerance sources"
        meta="every sampled deviation of the stack, in its unit; σ follows from the distribution"
        className="mt-3"
      >
        <ToleranceTable />
      </Card>

      <div className="mt-3 grid gap-3 2xl:grid-cols-[minmax(0,2.3fr)_minmax(0,1fr)]">
        <Card title="Requirements" meta="from the system budget; predicted yield from the live estimate">
          <RequirementsEditor estimate={estimate.summary} estimateStale={estimate.stale} />
        </Card>
        <Card title="Review notes" meta={`${revision.comments.length}`}>
          <ReviewNotes revision={revision} />
        </Card>
      </div>

      <ConfirmDialog
        open={leaveDialog}
        title="Leave without saving?"
        confirmLabel="Leave anyway"
        onClose={() => {
          setLeaveDialog(false);
          if (blocker.state === "blocked") blocker.reset();
        }}
        onConfirm={() => {
          setLeaveDialog(false);
          if (blocker.state === "blocked") blocker.proceed();
        }}
      >
        <p>
          {problemCount > 0
            ? `The draft has ${problemCount} problem${problemCount === 1 ? "" : "s"}, so the last edits are not saved on the server.`
            : "The last edits could not be saved on the server."}{" "}
          A copy stays in this browser and is offered when you open the revision again.
        </p>
      </ConfirmDialog>
    </EditorContext.Provider>
  );
}
