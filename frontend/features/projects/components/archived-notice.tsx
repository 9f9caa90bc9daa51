import type { Project } from "@shared/schemas/api";
import { Alert } from "@frontend/components/ui/alert";

/**
 * Said on every page under an archived project (the editor, a study, a data set, what-if): it is
 * read-only, the server refuses every change under it, so the page offers none. Nothing when open.
 */
export function ArchivedProjectNotice({
  project,
  toDo,
  className = "mb-4",
}: {
  project: Pick<Project, "name"> & Partial<Pick<Project, "archivedAt">>;
  /** what restoring the project would let one do here, e.g. "run this study again" */
  toDo: string;
  className?: string;
}) {
  if (!project.archivedAt) return null;
  return (
    <Alert tone="info" className={className} title={`The project “${project.name}” is archived: read only`}>
      Nothing in an archived project changes. Restore the project from its page to {toDo}.
    </Alert>
  );
}

/** Whether the project is archived (read-only): pages hide their write buttons for it. */
export const isArchived = (project: Partial<Pick<Project, "archivedAt">>) => !!project.archivedAt;
