import { useState, type FormEvent } from "react";
import type { Comment } from "@shared/schemas/revisions";
import { CommentBodySchema } from "@shared/schemas/revisions";
import { Badge, type BadgeTone } from "@frontend/components/ui/badge";
import { Button } from "@frontend/components/ui/button";
import { Textarea } from "@frontend/components/ui/field";
import { formatDateTime, formatRelative, initials } from "@frontend/lib/format";
import { parseForm, serverFieldErrors } from "@frontend/lib/form";
import { useAddReportComment } from "../api/add-report-comment";

const KIND: Record<string, { label: string; tone: BadgeTone } | undefined> = {
  question: { label: "Question", tone: "mag" },
  released: { label: "Released", tone: "pass" },
  acknowledged: { label: "Acknowledged", tone: "accel" },
};

/** The conversation on a report: the supplier's questions, staff answers, release and acknowledgement notes. */
export function ReportComments({
  reportId,
  comments,
  asSupplier,
  released,
}: {
  reportId: string;
  comments: Comment[];
  asSupplier: boolean;
  released: boolean;
}) {
  const add = useAddReportComment();
  const [body, setBody] = useState("");
  const [error, setError] = useState<string | undefined>();

  function submit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const parsed = parseForm(CommentBodySchema, { body });
    if (!parsed.ok) return setError(parsed.errors.body);
    setError(undefined);
    add.mutate(
      { id: reportId, body: parsed.data.body },
      { onSuccess: () => setBody(""), onError: (err) => setError(serverFieldErrors(err).body ?? serverFieldErrors(err)._form) },
    );
  }

  return (
    <div className="space-y-3">
      {comments.length === 0 ? <p className="text-xs text-ink/55">{asSupplier ? "No questions yet." : "No comments yet."}</p> : null}
      <ol className="space-y-3" aria-label="Comments">
        {comments.map((c) => {
          const k = KIND[c.kind];
          return (
            <li key={c.id} className="flex gap-2.5">
              <span
                className="mt-0.5 flex size-6 shrink-0 items-center justify-center rounded-full bg-ink/80 text-[9px] font-extrabold text-white"
                aria-hidden="true"
              >
                {c.authorName ? initials(c.authorName) : "·"}
              </span>
              <div className="min-w-0 flex-1 text-[13px]">
                <p className="flex flex-wrap items-center gap-1.5">
                  <span className="font-bold text-ink">{c.authorName ?? "Someone"}</span>
                  {k ? <Badge tone={k.tone}>{k.label}</Badge> : null}
                  <time dateTime={c.createdAt} title={formatDateTime(c.createdAt)} className="text-xs text-ink/45">
                    {formatRelative(c.createdAt)}
                  </time>
                </p>
                <p className="mt-0.5 whitespace-pre-line text-ink/80">{c.body}</p>
              </div>
            </li>
          );
        })}
      </ol>
      <form onSubmit={submit} noValidate className="space-y-2" aria-label={asSupplier ? "Ask a question" : "Add a comment"}>
        <Textarea
          aria-label={asSupplier ? "Your question" : "Your comment"}
          rows={3}
          value={body}
          invalid={!!error}
          onChange={(e) => setBody(e.target.value)}
          placeholder={
            asSupplier
              ? "Ask the engineer about a tolerance, a measurement or a date."
              : "Answer a question, or note something for the record."
          }
        />
        {error ? (
          <p role="alert" className="text-xs font-medium text-fail">
            {error}
          </p>
        ) : null}
        <div className="flex items-center justify-between gap-3">
          <p className="text-2xs leading-4 text-ink/50">
            {asSupplier
              ? "The engineers of this project see your question."
              : released
                ? "The supplier sees what you write here."
                : "Internal: the supplier does not see comments on a draft."}
          </p>
          <Button type="submit" size="sm" pending={add.isPending}>
            {asSupplier ? "Ask a question" : "Comment"}
          </Button>
        </div>
      </form>
    </div>
  );
}
