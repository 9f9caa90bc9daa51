import { zodResolver } from "@hookform/resolvers/zod";
import { useForm } from "react-hook-form";
import type { Comment } from "@shared/schemas/revisions";
import { CommentBodySchema } from "@shared/schemas/revisions";
import { Badge, type BadgeTone } from "@frontend/components/ui/badge";
import { Button } from "@frontend/components/ui/button";
import { Textarea } from "@frontend/components/ui/field";
import { formatDateTime, formatRelative, initials } from "@frontend/lib/format";
import { setServerErrors } from "@frontend/lib/form";
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
  const form = useForm({ resolver: zodResolver(CommentBodySchema), defaultValues: { body: "" } });
  const { errors } = form.formState;
  const error = errors.body?.message ?? errors.root?.server?.message;

  const submit = form.handleSubmit(({ body }) =>
    add.mutate({ id: reportId, body }, { onSuccess: () => form.reset(), onError: (err) => setServerErrors(form, err) }),
  );

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
          invalid={!!error}
          {...form.register("body")}
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
