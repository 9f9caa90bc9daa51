import { useMutation, useQueryClient } from "@tanstack/react-query";
import { RevisionSchema, type Revision } from "@shared/schemas/revisions";
import { projectKeys } from "@frontend/features/projects";
import { api } from "@frontend/lib/api-client";
import { revisionKeys } from "./keys";

/** A new draft revision with a copy of `fromId`'s stack and requirements: how an approved revision is edited. */
export function createDraftFrom(fromId: string): Promise<Revision> {
  return api.post(`/api/revisions/${encodeURIComponent(fromId)}/drafts`, undefined, RevisionSchema);
}

export function useCreateDraftFrom() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createDraftFrom,
    onSuccess: (revision) => {
      queryClient.setQueryData(revisionKeys.detail(revision.id), revision);
      return Promise.all([
        queryClient.invalidateQueries({ queryKey: revisionKeys.list(revision.projectId) }),
        queryClient.invalidateQueries({ queryKey: projectKeys.activity(revision.projectId) }),
      ]);
    },
  });
}
