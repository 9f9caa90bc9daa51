import type { Project } from "@shared/schemas/api";
import { ConfirmDialog } from "@frontend/components/ui/confirm-dialog";
import { useSetProjectArchived } from "../api/archive-project";

/** What archiving does, said once for both dialogs that offer it. */
export const ARCHIVE_MEANS =
  "An archived project is read-only: its revisions, studies, data sets and reports stay as they are and can be opened, but nothing can be changed or added. It leaves the default project list (a filter shows it) and can be restored.";

export function ArchiveProjectDialog({ project, open, onClose }: { project: Project; open: boolean; onClose: () => void }) {
  const archive = useSetProjectArchived();
  function close() {
    archive.reset();
    onClose();
  }
  return (
    <ConfirmDialog
      open={open}
      onClose={close}
      title="Archive this project?"
      confirmLabel="Archive project"
      pending={archive.isPending}
      error={archive.error?.message}
      onConfirm={() => archive.mutate({ id: project.id, version: project.version, archived: true }, { onSuccess: close })}
    >
      <p>
        <strong className="font-bold text-ink">{project.name}</strong>: {ARCHIVE_MEANS}
      </p>
    </ConfirmDialog>
  );
}
