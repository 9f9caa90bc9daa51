import { useMutation, useQueryClient } from "@tanstack/react-query";
import type * as z from "zod";
import { RevisionSchema, type CreateRevisionSchema, type Revision } from "@shared/schemas/revisions";
import { projectKeys } from "@frontend/features/projects";
import { api } from "@frontend/lib/api-client";
import { revisionKeys } from "./keys";

export type CreateRevisionInput = { projectId: string } & z.input<typeof CreateRevisionSchema>;

export function createRevision({ projectId, ...body }: CreateRevisionInput): Promise<Revision> {
  return api.post(`/api/projects/${encodeURIComponent(projectId)}/revisions`, body, RevisionSchema);
}

export function useCreateRevision() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createRevision,
    onSuccess: (revision) => {
      queryClient.setQueryData(revisionKeys.detail(revision.id), revision);
      return Promise.all([
        queryClient.invalidateQueries({ queryKey: revisionKeys.list(revision.projectId) }),
        queryClient.invalidateQueries({ queryKey: projectKeys.activity(revision.projectId) }),
      ]);
    },
  });
}
