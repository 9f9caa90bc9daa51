import { useMutation, useQueryClient } from "@tanstack/react-query";
import { projectKeys } from "@frontend/features/projects";
import { api } from "@frontend/lib/api-client";
import { datasetKeys } from "./keys";

export function deleteDataset({ id }: { id: string; projectId: string }): Promise<void> {
  return api.delete(`/api/datasets/${encodeURIComponent(id)}`);
}

export function useDeleteDataset() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deleteDataset,
    onSuccess: (_v, { id, projectId }) => {
      queryClient.removeQueries({ queryKey: datasetKeys.detail(id) });
      return Promise.all([
        queryClient.invalidateQueries({ queryKey: datasetKeys.list(projectId) }),
        queryClient.invalidateQueries({ queryKey: projectKeys.activity(projectId) }),
      ]);
    },
  });
}
