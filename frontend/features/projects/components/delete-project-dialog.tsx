import { useState } from "react";
import type { Project } from "@shared/schemas/api";
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { Dialog } from "@frontend/components/ui/dialog";
import { Field, Input } from "@frontend/components/ui/field";
import { isApiError } from "@frontend/lib/api-client";
import { useSetProjectArchived } from "../api/archive-project";
import { useDeleteProject } from "../api/delete-project";
import { ARCHIVE_MEANS } from "./archive-project-dialog";

/**
 * Deleting a project. One holding kept records (an approved revision, a released report, an
 * acknowledgement) answers 409 (backend/services/project-records.ts): an engineer is told why and
 * offered to archive it instead; an admin may delete it only by typing its name.
 */
export function DeleteProjectDialog({
  project,
  open,
  onClose,
  onDeleted,
}: {
  project: Project;
  open: boolean;
  onClose: () => void;
  onDeleted?: () => void;
}) {
  const remove = useDeleteProject();
  const archive = useSetProjectArchived();
  const [typed, setTyped] = useState("");
  const code = isApiError(remove.error) ? remove.error.code : null;
  // once the server asked for the name, the dialog keeps asking for it (a wrong name is a 400)
  const [needsName, setNeedsName] = useState(false);
  const kept = code === "records_kept";
  const asksName = needsName || code === "confirmation_required";
  const nameError = isApiError(remove.error) ? remove.error.fields.find((f) => f.path === "confirm")?.message : undefined;
  const busy = remove.isPending || archive.isPending;
  const canArchive = project.archivedAt === null;

  function close() {
    remove.reset();
    archive.reset();
    onClose();
  }
  function deleteIt() {
    remove.mutate(
      { id: project.id, version: project.version, confirm: asksName ? typed : undefined },
      {
        onSuccess: () => {
          close();
          onDeleted?.();
        },
        onError: (e) => {
          if (isApiError(e) && e.code === "confirmation_required") setNeedsName(true);
        },
      },
    );
  }
  const archiveInstead = canArchive ? (
    <Button
      variant={kept ? "primary" : "secondary"}
      onClick={() => archive.mutate({ id: project.id, version: project.version, archived: true }, { onSuccess: close })}
      pending={archive.isPending}
      disabled={remove.isPending}
    >
      Archive instead
    </Button>
  ) : null;

  return (
    <Dialog
      open={open}
      onClose={close}
      title={kept ? "This project keeps records" : asksName ? "Delete the project with its records?" : "Delete this project?"}
      size="sm"
      busy={busy}
      footer={
        <>
          <Button variant="secondary" onClick={close} disabled={busy} data-autofocus>
            {kept ? "Close" : "Cancel"}
          </Button>
          {kept || asksName ? archiveInstead : null}
          {kept ? null : (
            <Button
              variant="danger"
              onClick={deleteIt}
              pending={remove.isPending}
              disabled={archive.isPending || (asksName && typed !== project.name)}
            >
              {asksName ? "Delete with its records" : "Delete project"}
            </Button>
          )}
        </>
      }
    >
      <div className="space-y-3 text-[13px] text-ink/75">
        {kept ? (
          <>
            <Alert tone="info">{remove.error?.message}</Alert>
            <p>
              Approved revisions, released reports and supplier acknowledgements are the record of decisions made, so they are never deleted
              by accident. {canArchive ? ARCHIVE_MEANS : "The project is archived already."}
            </p>
          </>
        ) : asksName ? (
          <>
            <Alert tone="info">
              {code === "confirmation_required"
                ? remove.error?.message
                : `“${project.name}” holds records that are kept. To delete them with it, confirm with the project's name.`}
            </Alert>
            <p>
              They go for everyone in the workspace, with the stack revisions, studies, data sets and reports; the workspace's activity
              records the deletion. {canArchive ? "Archiving keeps them instead." : null}
            </p>
            <Field label="Type the project's name to confirm" error={nameError}>
              {({ id, describedBy, invalid }) => (
                <Input
                  id={id}
                  value={typed}
                  autoComplete="off"
                  spellCheck={false}
                  invalid={invalid}
                  aria-describedby={describedBy}
                  placeholder={project.name}
                  onChange={(e) => setTyped(e.target.value)}
                />
              )}
            </Field>
          </>
        ) : (
          <p>
            <strong className="font-bold text-ink">{project.name}</strong> will be removed for everyone in the workspace, with its stack
            revisions, studies, data sets and reports. This cannot be undone.
          </p>
        )}
        {remove.error && !kept && code !== "confirmation_required" && !nameError ? <Alert>{remove.error.message}</Alert> : null}
        {archive.error ? <Alert>{archive.error.message}</Alert> : null}
      </div>
    </Dialog>
  );
}
