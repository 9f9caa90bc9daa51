/**
 * A project's stack revisions: number, stack name, status, who and when; open one, start
 * a draft from an approved one, start a new stack or import a stack file.
 */
import { Fragment, useRef, useState } from "react";
import { Link, useNavigate } from "react-router";
import { Button } from "@frontend/components/ui/button";
import { EmptyState } from "@frontend/components/ui/empty-state";
import { PlusIcon } from "@frontend/components/ui/icons";
import { Panel } from "@frontend/components/ui/panel";
import { Spinner } from "@frontend/components/ui/spinner";
import {
  ImportIssuesDialog,
  MAX_IMPORT_BYTES,
  readStackFileText,
  starterStack,
  withElementIds,
  type ImportIssue,
} from "@frontend/features/stack-files";
import { isApiError } from "@frontend/lib/api-client";
import { formatDateTime, formatRelative } from "@frontend/lib/format";
import { useCreateDraftFrom } from "../api/create-draft";
import { useCreateRevision } from "../api/create-revision";
import { useRevisions } from "../api/get-revisions";
import { RevisionChanges } from "./revision-changes";
import { RevisionStatusChip } from "./revision-status-chip";
import { TemplateDialog } from "./template-dialog";

const StackIcon = () => (
  <svg
    width="18"
    height="18"
    viewBox="0 0 16 16"
    fill="none"
    stroke="currentColor"
    strokeWidth="1.4"
    strokeLinejoin="round"
    aria-hidden="true"
  >
    <rect x="1.5" y="11" width="13" height="2.5" rx="0.6" />
    <rect x="3.5" y="7.5" width="9" height="2.5" rx="0.6" />
    <rect x="5.5" y="4" width="5" height="2.5" rx="0.6" />
  </svg>
);

export function RevisionsPanel({ projectId, projectName, canWrite }: { projectId: string; projectName: string; canWrite: boolean }) {
  const revisions = useRevisions(projectId);
  const create = useCreateRevision();
  const draft = useCreateDraftFrom();
  const navigate = useNavigate();
  const input = useRef<HTMLInputElement>(null);
  const [refused, setRefused] = useState<{ fileName: string; message: string; issues: ImportIssue[] } | null>(null);
  const [templatesOpen, setTemplatesOpen] = useState(false);
  /** the revisions whose change set is shown under their row */
  const [shown, setShown] = useState<ReadonlySet<string>>(new Set());
  const toggle = (id: string) =>
    setShown((s) => {
      const next = new Set(s);
      if (!next.delete(id)) next.add(id);
      return next;
    });
  const open = (id: string) => navigate(`/projects/${projectId}/revisions/${id}`);

  async function importFile(file: File) {
    if (file.size > MAX_IMPORT_BYTES) {
      setRefused({ fileName: file.name, message: "the file is larger than 20 MB", issues: [] });
      return;
    }
    const r = readStackFileText(await file.text());
    if (!r.ok) {
      setRefused({ fileName: file.name, message: r.message, issues: r.issues });
      return;
    }
    create.mutate(
      { projectId, stack: r.stack, note: `Imported from ${file.name}.` },
      {
        onSuccess: (rev) => open(rev.id),
        onError: (e) =>
          setRefused({
            fileName: file.name,
            message: e.message,
            issues: isApiError(e)
              ? withElementIds(
                  r.stack,
                  e.fields.map((f) => ({ path: f.path.replace(/^stack\.?/, ""), message: f.message })),
                )
              : [],
          }),
      },
    );
  }

  const list = revisions.data ?? [];
  const actions = canWrite ? (
    <>
      <input
        ref={input}
        type="file"
        accept=".json,application/json"
        className="sr-only"
        tabIndex={-1}
        aria-label="Stack file for a new revision"
        data-testid="new-revision-file"
        onChange={(e) => {
          const f = e.target.files?.[0];
          e.target.value = "";
          if (f) void importFile(f);
        }}
      />
      <Button size="sm" variant="ghost" onClick={() => input.current?.click()} disabled={create.isPending}>
        Import stack file…
      </Button>
      <Button size="sm" variant="secondary" onClick={() => setTemplatesOpen(true)} disabled={create.isPending}>
        New stack from a template…
      </Button>
      <Button
        size="sm"
        variant="primary"
        icon={<PlusIcon />}
        pending={create.isPending}
        onClick={() =>
          create.mutate({ projectId, stack: starterStack(projectName), note: "New stack." }, { onSuccess: (rev) => open(rev.id) })
        }
      >
        New stack
      </Button>
    </>
  ) : null;

  return (
    <Panel
      title="Stack revisions"
      accent="var(--color-asic)"
      meta={list.length ? String(list.length) : undefined}
      actions={actions}
      padded={false}
      className="md:col-span-2"
    >
      {revisions.isPending ? (
        <div className="flex items-center gap-2 px-4 py-6 text-[13px] text-ink/55">
          <Spinner /> Loading revisions…
        </div>
      ) : revisions.isError ? (
        <p className="px-4 py-6 text-[13px] text-fail">{revisions.error.message}</p>
      ) : list.length === 0 ? (
        <EmptyState icon={<StackIcon />} title="No stack yet" className="py-8">
          {canWrite
            ? "Start from a template with typical tolerances, from a bare board, or import a stack file."
            : "An engineer has not entered this project's stack yet."}
        </EmptyState>
      ) : (
        <table className="w-full border-collapse text-left text-[13px]" aria-label="Stack revisions">
          <thead className="border-b border-line bg-paper/70">
            <tr className="text-2xs font-bold tracking-[0.06em] text-ink/55 uppercase">
              <th scope="col" className="h-8 w-14 px-4 text-right">
                Rev
              </th>
              <th scope="col" className="w-full px-3">
                Stack
              </th>
              <th scope="col" className="px-3">
                Status
              </th>
              <th scope="col" className="px-3">
                Who, when
              </th>
              <th scope="col" className="px-3">
                <span className="sr-only">Actions</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {list.map((r) => (
              <Fragment key={r.id}>
                <tr className="border-b border-line/70 last:border-b-0 hover:bg-paper/60">
                  <td className="num h-11 px-4 font-extrabold text-ink">{r.number}</td>
                  <td className="max-w-0 px-3 py-1.5">
                    <Link
                      to={`/projects/${projectId}/revisions/${r.id}`}
                      className="block font-bold break-words text-ink decoration-ink/30 underline-offset-2 hover:underline"
                      aria-label={`Open revision ${r.number}`}
                    >
                      {r.name || <span className="text-ink/45">Untitled stack</span>}
                    </Link>
                    {r.note ? (
                      <p className="text-xs break-words text-ink/55">{r.note}</p>
                    ) : r.basedOnId ? (
                      <p className="text-xs text-ink/45">
                        From revision {list.find((b) => b.id === r.basedOnId)?.number ?? "?"}; no note yet on what changed and why.
                      </p>
                    ) : null}
                    {r.number > 1 ? (
                      <button
                        type="button"
                        aria-expanded={shown.has(r.id)}
                        aria-controls={`changes-${r.id}`}
                        onClick={() => toggle(r.id)}
                        className="mt-0.5 text-xs font-semibold text-gyro hover:underline"
                      >
                        {shown.has(r.id) ? "Hide changes" : "What changed"}
                        <span className="sr-only"> in revision {r.number}</span>
                      </button>
                    ) : null}
                  </td>
                  <td className="px-3">
                    <RevisionStatusChip status={r.status} />
                  </td>
                  <td className="px-3 text-xs whitespace-nowrap text-ink/65">
                    {r.status === "approved" && r.approvedAt ? (
                      <>
                        Approved by {r.approvedByName ?? "—"}
                        <br />
                        <time dateTime={r.approvedAt} className="text-ink/45 tabular-nums">
                          {formatDateTime(r.approvedAt)}
                        </time>
                      </>
                    ) : (
                      <>
                        {r.createdByName ?? "—"}
                        <br />
                        <time dateTime={r.updatedAt} title={formatDateTime(r.updatedAt)} className="text-ink/45">
                          {r.status === "in_review" && r.submittedAt
                            ? `submitted ${formatRelative(r.submittedAt)}`
                            : `edited ${formatRelative(r.updatedAt)}`}
                        </time>
                      </>
                    )}
                  </td>
                  <td className="px-3 text-right whitespace-nowrap">
                    {canWrite && r.status === "approved" ? (
                      <Button
                        size="sm"
                        variant="ghost"
                        pending={draft.isPending && draft.variables === r.id}
                        onClick={() => draft.mutate(r.id, { onSuccess: (rev) => open(rev.id) })}
                        aria-label={`Start a draft from revision ${r.number}`}
                      >
                        New draft from it
                      </Button>
                    ) : null}
                    <Button
                      size="sm"
                      variant={r.status === "draft" && canWrite ? "primary" : "secondary"}
                      onClick={() => open(r.id)}
                      className="ml-1"
                    >
                      {r.status === "draft" && canWrite ? "Edit" : "Open"}
                    </Button>
                  </td>
                </tr>
                {shown.has(r.id) ? (
                  <tr id={`changes-${r.id}`} className="border-b border-line/70 bg-paper/40">
                    <td />
                    <td colSpan={4} className="px-3 py-2">
                      <RevisionChanges revisionId={r.id} updatedAt={r.updatedAt} />
                    </td>
                  </tr>
                ) : null}
              </Fragment>
            ))}
          </tbody>
        </table>
      )}
      {create.isError && !refused ? <p className="border-t border-line px-4 py-2 text-xs text-fail">{create.error.message}</p> : null}
      {draft.isError ? <p className="border-t border-line px-4 py-2 text-xs text-fail">{draft.error.message}</p> : null}
      {refused ? <ImportIssuesDialog open onClose={() => setRefused(null)} {...refused} /> : null}
      {canWrite ? (
        <TemplateDialog
          open={templatesOpen}
          onClose={() => setTemplatesOpen(false)}
          pending={create.isPending}
          onChoose={(t) =>
            create.mutate(
              {
                projectId,
                stack: { ...t.stack, name: projectName },
                requirements: t.requirements,
                note: `New stack from the template "${t.name}".`,
              },
              {
                onSuccess: (rev) => {
                  setTemplatesOpen(false);
                  open(rev.id);
                },
              },
            )
          }
        />
      ) : null}
    </Panel>
  );
}
