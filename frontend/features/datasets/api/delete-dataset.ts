import { useMutation, useQueryClient } from "@tanstack/react-query";
import { projectKeys } from "@frontend/features/projects";
import { api } from "@frontend/lib/api-client";
import { reloadOnConflict } from "@frontend/lib/query-client";
import { datasetKeys } from "./keys";

/** On the version last read: a data set someone else changed meanwhile is a 409, and is kept. */
export function deleteDataset({ id, version }: { id: string; projectId: string; version: number }): Promise<void> {
  return api.delete(`/api/datasets/${encodeURIComponent(id)}`, version);
}

export function useDeleteDataset() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deleteDataset,
    onError: (error, { id, projectId }) => reloadOnConflict(queryClient, error, datasetKeys.detail(id), datasetKeys.list(projectId)),
    onSuccess: (_v, { id, projectId }) => {
      queryClient.removeQueries({ queryKey: datasetKeys.detail(id) });
      return Promise.all([
        queryClient.invalidateQueries({ queryKey: datasetKeys.list(projectId) }),
        queryClient.invalidateQueries({ queryKey: projectKeys.activity(projectId) }),
      ]);
    },
  });
}
