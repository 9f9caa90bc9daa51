import type { Project } from "@shared/schemas/api";
import { ConfirmDialog } from "@frontend/components/ui/confirm-dialog";
import { useDeleteProject } from "../api/delete-project";

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
  function close() {
    remove.reset();
    onClose();
  }
  return (
    <ConfirmDialog
      open={open}
      onClose={close}
      title="Delete this project?"
      confirmLabel="Delete project"
      pending={remove.isPending}
      error={remove.error?.message}
      onConfirm={() =>
        remove.mutate(project.id, {
          onSuccess: () => {
            close();
            onDeleted?.();
          },
        })
      }
    >
      <p>
        <strong className="font-bold text-ink">{project.name}</strong> will be removed for everyone in the workspace, with its stack
        revisions, studies, data sets and reports. This cannot be undone.
      </p>
    </ConfirmDialog>
  );
}
