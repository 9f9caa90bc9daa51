import { useMutation, useQueryClient } from "@tanstack/react-query";
import { StudySummarySchema, type CreateStudy, type StudySummary } from "@shared/schemas/studies";
import { api } from "@frontend/lib/api-client";
import { projectKeys } from "@frontend/features/projects";
import { studyKeys } from "./keys";

export function createStudy({ revisionId, body }: { revisionId: string; body: CreateStudy }): Promise<StudySummary> {
  return api.post(`/api/revisions/${encodeURIComponent(revisionId)}/studies`, body, StudySummarySchema);
}

export function useCreateStudy() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createStudy,
    // Not awaited: the caller moves on to the new study's page at once.
    onSuccess: (study) => {
      void queryClient.invalidateQueries({ queryKey: studyKeys.list(study.projectId) });
      void queryClient.invalidateQueries({ queryKey: projectKeys.detail(study.projectId) });
      void queryClient.invalidateQueries({ queryKey: projectKeys.lists() });
    },
  });
}
