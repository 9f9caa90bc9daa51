/**
 * The review workflow in the editor: engineers submit a draft and start new drafts from
 * frozen revisions; reviewers approve an in-review revision or send it back with a
 * reason; everyone who can read leaves notes.
 */
import { useState } from "react";
import { zodResolver } from "@hookform/resolvers/zod";
import { useForm } from "react-hook-form";
import type { Me } from "@shared/schemas/api";
import { ApproveRevisionSchema, CommentBodySchema, ReturnRevisionSchema, type Revision } from "@shared/schemas/revisions";
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { Dialog } from "@frontend/components/ui/dialog";
import { Textarea } from "@frontend/components/ui/field";
import { CheckIcon } from "@frontend/components/ui/icons";
import {
  NoteDialog,
  NoteField,
  RevisionChanges,
  SubmitDialog,
  useAddRevisionComment,
  useApproveRevision,
  useCreateDraftFrom,
  useReturnRevision,
} from "@frontend/features/revisions";
import { cn } from "@frontend/lib/cn";
import { sentence, setServerErrors } from "@frontend/lib/form";
import { formatDateTime, initials } from "@frontend/lib/format";
import { can } from "@frontend/lib/permissions";

// the reviewer's dialog holds one text either way (sending back says why; an approval's may be blank)
const ApproveFormSchema = ApproveRevisionSchema.required({ comment: true });

export function ReviewActions({
  revision,
  me,
  flush,
  version,
  onMoved,
  problems,
  onDraft,
}: {
  revision: Revision;
  me: Me;
  flush: () => Promise<boolean>;
  /** the version of the revision as this page shows it (a change made meanwhile by someone else is a conflict) */
  version: () => number;
  /** our own action moved the revision to a new version (its content unchanged) */
  onMoved: (revision: Revision) => void;
  problems: number;
  onDraft: (id: string) => void;
}) {
  const canWrite = can(me.role, "revisions.write");
  const canReview = can(me.role, "revisions.review");
  const approve = useApproveRevision();
  const sendBack = useReturnRevision();
  const draft = useCreateDraftFrom();
  const [dialog, setDialog] = useState<"approve" | "return" | "submit" | "note" | "submit-error" | null>(null);
  /** the draft's version once its last edits are saved: what the submit or the note is made on */
  const [savedAt, setSavedAt] = useState(0);
  const [flushing, setFlushing] = useState(false);
  const review = useForm<{ comment: string }, unknown, { comment: string }>({
    resolver: dialog === "return" ? zodResolver(ReturnRevisionSchema) : zodResolver(ApproveFormSchema),
    defaultValues: { comment: "" },
  });
  const reviewErrors = review.formState.errors;
  const [submitError, setSubmitError] = useState<string | null>(null);

  /** Saves the last edits, then opens the submit (or note) dialog on the version they were saved at. */
  async function openSaved(d: "submit" | "note") {
    setSubmitError(null);
    if (d === "submit" && problems > 0) {
      setSubmitError(`Fix the ${problems === 1 ? "problem" : `${problems} problems`} first: a reviewer can only approve a valid stack.`);
      setDialog("submit-error");
      return;
    }
    setFlushing(true);
    const saved = await flush().finally(() => setFlushing(false));
    if (!saved) {
      setSubmitError(`The last edits could not be saved, so the draft ${d === "submit" ? "was not submitted" : "keeps its note"}.`);
      setDialog("submit-error");
      return;
    }
    setSavedAt(version());
    setDialog(d);
  }
  const moved = (r: Revision) => {
    onMoved(r);
    setDialog(null);
  };

  const onReview = review.handleSubmit(({ comment }) => {
    const done = { onSuccess: (r: Revision) => (onMoved(r), setDialog(null)), onError: (e: unknown) => setServerErrors(review, e) };
    if (dialog === "return") sendBack.mutate({ id: revision.id, version: version(), comment }, done);
    else approve.mutate({ id: revision.id, version: version(), comment: comment || undefined }, done);
  });

  const open = (d: "approve" | "return") => {
    review.reset({ comment: "" });
    approve.reset();
    sendBack.reset();
    setDialog(d);
  };
  const reviewMutation = dialog === "return" ? sendBack : approve;

  return (
    <>
      {revision.status === "draft" && canWrite ? (
        <>
          <Button size="sm" variant="ghost" onClick={() => void openSaved("note")} disabled={flushing}>
            Note…
          </Button>
          <Button size="sm" variant="primary" onClick={() => void openSaved("submit")} pending={flushing}>
            Submit for review
          </Button>
        </>
      ) : null}
      {revision.status === "in_review" && canReview ? (
        <>
          <Button size="sm" onClick={() => open("return")}>
            Send back…
          </Button>
          <Button size="sm" variant="primary" icon={<CheckIcon />} onClick={() => open("approve")}>
            Approve…
          </Button>
        </>
      ) : null}
      {revision.status !== "draft" && canWrite ? (
        <Button
          size="sm"
          variant="primary"
          pending={draft.isPending}
          onClick={() => draft.mutate(revision.id, { onSuccess: (r) => onDraft(r.id) })}
        >
          Start a new draft from this revision
        </Button>
      ) : null}
      {draft.isError ? <span className="text-xs text-fail">{draft.error.message}</span> : null}

      <Dialog
        open={dialog === "approve" || dialog === "return"}
        onClose={() => setDialog(null)}
        busy={reviewMutation.isPending}
        title={dialog === "return" ? `Send revision ${revision.number} back` : `Approve revision ${revision.number}`}
        description={
          dialog === "return"
            ? "It returns to draft so the engineer can change it. Say what needs to change."
            : "Approved revisions are frozen: studies and supplier reports can rely on them."
        }
        onSubmit={onReview}
        formLabel={dialog === "return" ? "Send back" : "Approve"}
        footer={
          <>
            <Button onClick={() => setDialog(null)} disabled={reviewMutation.isPending}>
              Cancel
            </Button>
            <Button type="submit" variant="primary" pending={reviewMutation.isPending}>
              {dialog === "return" ? "Send back to draft" : "Approve revision"}
            </Button>
          </>
        }
      >
        <div className="mb-3">
          <RevisionChanges revisionId={revision.id} updatedAt={revision.updatedAt} />
        </div>
        <NoteField
          label={dialog === "return" ? "Reason" : "Comment"}
          aside={dialog === "return" ? undefined : "optional"}
          error={reviewErrors.comment?.message}
          rows={4}
          maxLength={4000}
          field={review.register("comment")}
        />
        {reviewErrors.root?.server ? <Alert className="mt-3">{reviewErrors.root.server.message}</Alert> : null}
      </Dialog>

      {dialog === "submit" ? (
        <SubmitDialog open revision={revision} version={savedAt} onClose={() => setDialog(null)} onSubmitted={moved} />
      ) : null}
      {dialog === "note" ? <NoteDialog revision={revision} version={savedAt} onClose={() => setDialog(null)} onSaved={moved} /> : null}

      <Dialog
        open={dialog === "submit-error"}
        onClose={() => setDialog(null)}
        title="Not submitted"
        size="sm"
        footer={
          <Button onClick={() => setDialog(null)} data-autofocus>
            Close
          </Button>
        }
      >
        <p className="text-[13px] text-ink/75">{submitError}</p>
      </Dialog>
    </>
  );
}

const KIND_LABEL: Record<string, string> = { approved: "approved", returned: "sent back", comment: "" };

export function ReviewNotes({ revision }: { revision: Revision }) {
  const add = useAddRevisionComment(revision);
  const form = useForm({ resolver: zodResolver(CommentBodySchema), defaultValues: { body: "" } });
  const error = form.formState.errors.body?.message ?? form.formState.errors.root?.server?.message;
  return (
    <div className="flex flex-col">
      {revision.status === "in_review" && revision.number > 1 ? (
        // what the reviewer decides on, in view before Approve or Send back is pressed
        <div className="border-b border-line px-3.5 py-2.5">
          <RevisionChanges revisionId={revision.id} updatedAt={revision.updatedAt} />
        </div>
      ) : null}
      {revision.comments.length === 0 ? (
        <p className="px-3.5 py-3 text-[13px] text-ink/55">No notes yet.</p>
      ) : (
        <ol className="max-h-64 divide-y divide-line/70 overflow-y-auto" aria-label="Review notes">
          {revision.comments.map((c) => (
            <li key={c.id} className="flex gap-2.5 px-3.5 py-2.5">
              <span className="flex size-6 shrink-0 items-center justify-center rounded-full bg-ink text-[9px] font-extrabold text-paper">
                {initials(c.authorName ?? "?")}
              </span>
              <div className="min-w-0 text-xs">
                <p>
                  <span className="font-bold text-ink">{c.authorName ?? "Someone"}</span>{" "}
                  {KIND_LABEL[c.kind] ? (
                    <span className={cn("font-semibold", c.kind === "approved" ? "text-pass" : "text-fail")}>{KIND_LABEL[c.kind]}</span>
                  ) : null}
                  <span className="ml-1.5 text-ink/45">{formatDateTime(c.createdAt)}</span>
                </p>
                {c.body ? <p className="mt-0.5 whitespace-pre-line text-ink/75">{c.body}</p> : null}
              </div>
            </li>
          ))}
        </ol>
      )}
      <form
        className="flex items-start gap-2 border-t border-line px-3.5 py-2.5"
        onSubmit={form.handleSubmit(({ body }) =>
          add.mutate({ id: revision.id, body }, { onSuccess: () => form.reset(), onError: (e) => setServerErrors(form, e) }),
        )}
      >
        <div className="min-w-0 flex-1">
          <Textarea
            aria-label="New note"
            rows={2}
            placeholder="Add a note for the engineer or the reviewer"
            invalid={!!error}
            className="text-xs"
            {...form.register("body")}
          />
          {error ? <p className="mt-1 text-[11px] text-fail">{sentence(error)}</p> : null}
        </div>
        <Button size="sm" type="submit" pending={add.isPending}>
          Add note
        </Button>
      </form>
    </div>
  );
}
