/**
 * The draft's note, "what changed and why", edited on its own (the submit dialog asks for it
 * too). Saved with the version the draft was read at, like every change of a shared record: a
 * stale one is refused and said so, nothing overwritten.
 */
import { zodResolver } from "@hookform/resolvers/zod";
import { useForm } from "react-hook-form";
import type { Revision } from "@shared/schemas/revisions";
import { UpdateRevisionSchema } from "@shared/schemas/revisions";
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { Dialog } from "@frontend/components/ui/dialog";
import { setServerErrors } from "@frontend/lib/form";
import { useUpdateRevision } from "../api/update-revision";
import { NoteField } from "./note-field";

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
  const form = useForm({ resolver: zodResolver(UpdateRevisionSchema), defaultValues: { note: revision.note } });
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit(({ note }) =>
    update.mutate({ id: revision.id, version, changes: { note } }, { onSuccess: onSaved, onError: (e) => setServerErrors(form, e) }),
  );

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
      <NoteField label="What changed and why" error={errors.note?.message} rows={4} maxLength={2000} field={form.register("note")} />
      {errors.root?.server ? <Alert className="mt-3">{errors.root.server.message}</Alert> : null}
    </Dialog>
  );
}
