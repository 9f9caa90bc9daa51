/**
 * Submitting a draft for review, with eyes open: what changed since the revision before, the
 * note that says why (asked for on every revision after the first), and each requirement the
 * draft misses, by its study or the live estimate, which the engineer confirms before submitting.
 */
import { useState } from "react";
import { zodResolver } from "@hookform/resolvers/zod";
import { useForm } from "react-hook-form";
import type { CheckSource, RequirementCheck, Revision } from "@shared/schemas/revisions";
import { SubmitRevisionSchema } from "@shared/schemas/revisions";
import { formatCount, formatWritten, formatYield } from "@shared/format";
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { Dialog } from "@frontend/components/ui/dialog";
import { isApiError } from "@frontend/lib/api-client";
import { setServerErrors } from "@frontend/lib/form";
import { useRequirementCheck } from "../api/get-requirement-check";
import { useSubmitRevision } from "../api/submit-revision";
import { NoteField } from "./note-field";
import { RevisionChanges } from "./revision-changes";

/** A revision after the first says why it differs from the one before. */
const NoteRequiredSchema = SubmitRevisionSchema.refine((v) => !!v.note, {
  path: ["note"],
  message: "say what changed and why: a revision after the first needs a note",
});

export const sourceWords = (s: CheckSource) =>
  s.kind === "study" ? `study ${s.number}` : `live estimate, ${formatCount(s.trials)} trials at ${s.inclinationDeg}° inclination`;

/** One requirement as the dialog and the reviewer read it: "≤ 2°: 97.03 % of units, 99.00 % asked". */
function FailingRow({ r }: { r: RequirementCheck }) {
  return (
    <li className="px-2.5 py-1.5">
      <p className="font-semibold break-words text-ink">
        {r.label} <span className="font-normal text-ink/60">≤ {formatWritten(r.max, r.unit)}</span>
      </p>
      <p className="text-xs text-ink/70 tabular-nums">
        <span className="font-bold text-fail">{formatYield(r.reached)}</span> of units within the limit, {formatYield(r.target)} asked ·{" "}
        <span className="text-ink/55">{sourceWords(r.source)}</span>
      </p>
    </li>
  );
}

/** Mount it when it opens (a fresh form each time: the note as it is now, nothing confirmed yet). */
export function SubmitDialog({
  open,
  revision,
  version,
  onClose,
  onSubmitted,
}: {
  open: boolean;
  revision: Revision;
  /** the version the draft is submitted at (the editor's, once its last edits are saved) */
  version: number;
  onClose: () => void;
  onSubmitted: (revision: Revision) => void;
}) {
  const check = useRequirementCheck(revision.id, version, open);
  const submit = useSubmitRevision();
  const noteRequired = revision.number > 1;
  const form = useForm({
    resolver: zodResolver(noteRequired ? NoteRequiredSchema : SubmitRevisionSchema),
    defaultValues: { note: revision.note },
  });
  const { errors } = form.formState;
  const [confirmed, setConfirmed] = useState(false);

  const failing = check.data?.failing ?? [];
  const blocked = check.isPending || check.isError || (failing.length > 0 && !confirmed);

  const onSubmit = form.handleSubmit(({ note }) =>
    submit.mutate(
      { id: revision.id, version, note, confirmFailing: failing.length > 0 && confirmed ? true : undefined },
      {
        onSuccess: onSubmitted,
        onError: (e) => {
          // judged again on the server meanwhile (a study finished): show the list it judged by
          if (isApiError(e) && e.code === "requirements_not_met") {
            setConfirmed(false);
            void check.refetch();
          }
          setServerErrors(form, e);
        },
      },
    ),
  );

  return (
    <Dialog
      open={open}
      onClose={onClose}
      busy={submit.isPending}
      title={`Submit revision ${revision.number} for review`}
      description="A reviewer approves it or sends it back; until then it is read only."
      onSubmit={onSubmit}
      formLabel="Submit for review"
      footer={
        <>
          <Button onClick={onClose} disabled={submit.isPending}>
            Cancel
          </Button>
          <Button type="submit" variant="primary" pending={submit.isPending} disabled={blocked}>
            {failing.length ? "Submit anyway" : "Submit for review"}
          </Button>
        </>
      }
    >
      <div className="mb-3">
        <RevisionChanges revisionId={revision.id} updatedAt={revision.updatedAt} />
      </div>
      <NoteField
        label="What changed and why"
        aside={noteRequired ? "required" : "optional"}
        error={errors.note?.message}
        hint="The reviewer reads it beside the list of changes."
        rows={3}
        maxLength={2000}
        field={form.register("note")}
      />
      <div className="mt-3 text-[13px]">
        {check.isPending ? (
          <p className="text-xs text-ink/55">Checking the requirements…</p>
        ) : check.isError ? (
          <Alert>{check.error.message}</Alert>
        ) : check.data.requirements.length === 0 ? (
          <p className="text-xs text-ink/55">The revision has no requirements to check.</p>
        ) : failing.length === 0 ? (
          <p className="text-xs font-semibold text-pass">
            {check.data.requirements.length === 1 ? "Its requirement is met" : `All ${check.data.requirements.length} requirements are met`}{" "}
            ({[...new Set(check.data.requirements.map((r) => sourceWords(r.source)))].join("; ")}).
          </p>
        ) : (
          <section aria-label="Requirements not met" className="rounded-md border border-fail/30 bg-fail/[0.04]">
            <p className="px-2.5 pt-2 text-xs font-bold text-fail">
              {failing.length === 1
                ? `1 of ${check.data.requirements.length} requirements is not met`
                : `${failing.length} of ${check.data.requirements.length} requirements are not met`}
            </p>
            <ul className="divide-y divide-fail/15">
              {failing.map((r) => (
                <FailingRow key={r.index} r={r} />
              ))}
            </ul>
            <label className="flex cursor-pointer items-start gap-2 border-t border-fail/20 px-2.5 py-2 text-xs font-semibold text-ink">
              <input
                type="checkbox"
                checked={confirmed}
                onChange={(e) => setConfirmed(e.target.checked)}
                className="mt-0.5 accent-[var(--color-fail)]"
              />
              I have seen what fails and submit it for review anyway
            </label>
          </section>
        )}
      </div>
      {errors.root?.server ? <Alert className="mt-3">{errors.root.server.message}</Alert> : null}
    </Dialog>
  );
}
