import { useMutation, useQueryClient } from "@tanstack/react-query";
import { DatasetSchema, type Dataset, type UpdateMappings } from "@shared/schemas/datasets";
import { projectKeys } from "@frontend/features/projects";
import { api } from "@frontend/lib/api-client";
import { datasetKeys } from "./keys";

export function updateMappings({ id, version, body }: { id: string; version: number; body: UpdateMappings }): Promise<Dataset> {
  return api.patch(`/api/datasets/${encodeURIComponent(id)}/mappings`, body, DatasetSchema, version);
}

export function useUpdateMappings() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateMappings,
    onSuccess: (dataset) => {
      queryClient.setQueryData(datasetKeys.detail(dataset.id), dataset);
      // statistics of a remapped column change unit and gain (or lose) capability
      return Promise.all([
        queryClient.invalidateQueries({ queryKey: [...datasetKeys.detail(dataset.id), "statistics"] }),
        queryClient.invalidateQueries({ queryKey: datasetKeys.list(dataset.projectId) }),
        queryClient.invalidateQueries({ queryKey: projectKeys.activity(dataset.projectId) }),
      ]);
    },
  });
}
