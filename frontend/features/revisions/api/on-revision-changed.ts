import type { QueryClient } from "@tanstack/react-query";
import type { Revision } from "@shared/schemas/revisions";
import { projectKeys } from "@frontend/features/projects";
import { revisionKeys } from "./keys";

/** After a state change (submit, approve, send back): the revision, its project's list and activity. */
export function onRevisionChanged(queryClient: QueryClient, revision: Revision) {
  queryClient.setQueryData(revisionKeys.detail(revision.id), revision);
  return Promise.all([
    queryClient.invalidateQueries({ queryKey: revisionKeys.list(revision.projectId) }),
    queryClient.invalidateQueries({ queryKey: projectKeys.activity(revision.projectId) }),
  ]);
}
