/**
 * The draft's note, "what changed and why", edited on its own (the submit dialog asks for it
 * too). Saved with the version the draft was read at, like every change of a shared record: a
 * stale one is refused and said so, nothing overwritten.
 */
import { useState, type FormEvent } from "react";
import type { Revision } from "@shared/schemas/revisions";
import { UpdateRevisionSchema } from "@shared/schemas/revisions";
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { Dialog } from "@frontend/components/ui/dialog";
import { Field, Textarea } from "@frontend/components/ui/field";
import { useUpdateRevision } from "../api/update-revision";

/** Mount it when it opens (a fresh form with the note as it is now). */
export function NoteDialog({
  revision,
  version,
  onClose,
  onSaved,
}: {
  revision: Revision;
  /** the version the note is changed on */
  version: number;
  onClose: () => void;
  onSaved: (revision: Revision) => void;
}) {
  const update = useUpdateRevision();
  const [note, setNote] = useState(revision.note);
  const [error, setError] = useState<string | null>(null);

  function onSubmit(event: FormEvent) {
    event.preventDefault();
    const parsed = UpdateRevisionSchema.safeParse({ note });
    if (!parsed.success) return setError(parsed.error.issues[0]?.message ?? "the note is not valid");
    setError(null);
    update.mutate({ id: revision.id, version, changes: { note: parsed.data.note } }, { onSuccess: onSaved });
  }

  return (
    <Dialog
      open
      onClose={onClose}
      busy={update.isPending}
      title={`Note of revision ${revision.number}`}
      description="What changed and why, for the reviewer. It can be changed until the draft is submitted."
      onSubmit={onSubmit}
      formLabel="Save note"
      footer={
        <>
          <Button onClick={onClose} disabled={update.isPending}>
            Cancel
          </Button>
          <Button type="submit" variant="primary" pending={update.isPending}>
            Save note
          </Button>
        </>
      }
    >
      <Field label="What changed and why" error={error ?? undefined}>
        {({ id, describedBy, invalid }) => (
          <Textarea
            id={id}
            aria-describedby={describedBy}
            invalid={invalid}
            rows={4}
            value={note}
            onChange={(e) => setNote(e.target.value)}
            maxLength={2000}
          />
        )}
      </Field>
      {update.isError ? <Alert className="mt-3">{update.error.message}</Alert> : null}
    </Dialog>
  );
}
