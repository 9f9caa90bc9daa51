import { useMutation, useQueryClient } from "@tanstack/react-query";
import { StudySummarySchema, type StudySummary } from "@shared/schemas/studies";
import { api } from "@frontend/lib/api-client";
import { projectKeys } from "@frontend/features/projects";
import { studyKeys } from "./keys";

/** Cancel a queued or running study, or put an interrupted, failed or cancelled one back in the queue. */
export function changeStudyState({ id, action }: { id: string; action: "cancel" | "rerun" }): Promise<StudySummary> {
  return api.post(`/api/studies/${encodeURIComponent(id)}/${action}`, {}, StudySummarySchema);
}

export function useChangeStudyState() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: changeStudyState,
    onSuccess: (study) =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: studyKeys.detail(study.id) }),
        queryClient.invalidateQueries({ queryKey: studyKeys.list(study.projectId) }),
        queryClient.invalidateQueries({ queryKey: projectKeys.detail(study.projectId) }),
        queryClient.invalidateQueries({ queryKey: projectKeys.activity(study.projectId) }),
      ]),
  });
}
