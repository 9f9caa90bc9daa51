import { useMutation, useQueryClient } from "@tanstack/react-query";
import { DatasetSchema, type Dataset, type UpdateDataset } from "@shared/schemas/datasets";
import { api } from "@frontend/lib/api-client";
import { datasetKeys } from "./keys";

/** Marks (or clears) the column that names each row's lot. */
export function updateDataset({ id, version, body }: { id: string; version: number; body: UpdateDataset }): Promise<Dataset> {
  return api.patch(`/api/datasets/${encodeURIComponent(id)}`, body, DatasetSchema, version);
}

export function useUpdateDataset() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateDataset,
    onSuccess: (dataset) => {
      queryClient.setQueryData(datasetKeys.detail(dataset.id), dataset);
      return queryClient.invalidateQueries({ queryKey: [...datasetKeys.detail(dataset.id), "statistics"] });
    },
  });
}
