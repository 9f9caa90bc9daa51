import { useMutation, useQueryClient } from "@tanstack/react-query";
import { DatasetSchema, type Dataset } from "@shared/schemas/datasets";
import { projectKeys } from "@frontend/features/projects";
import { apiRequest } from "@frontend/lib/api-client";
import { datasetKeys } from "./keys";

export function uploadDataset({ projectId, file }: { projectId: string; file: File }): Promise<Dataset> {
  const form = new FormData();
  form.append("file", file, file.name);
  return apiRequest(`/api/projects/${encodeURIComponent(projectId)}/datasets`, DatasetSchema, { method: "POST", body: form });
}

export function useUploadDataset() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: uploadDataset,
    onSuccess: (dataset) => {
      queryClient.setQueryData(datasetKeys.detail(dataset.id), dataset);
      return Promise.all([
        queryClient.invalidateQueries({ queryKey: datasetKeys.list(dataset.projectId) }),
        queryClient.invalidateQueries({ queryKey: projectKeys.activity(dataset.projectId) }),
      ]);
    },
  });
}
