import { useMutation, useQueryClient } from "@tanstack/react-query";
import { DatasetSchema, type Dataset } from "@shared/schemas/datasets";
import { projectKeys } from "@frontend/features/projects";
import { apiRequest } from "@frontend/lib/api-client";
import { datasetKeys } from "./keys";

export function uploadDataset({
  projectId,
  file,
  lot,
  note,
}: {
  projectId: string;
  file: File;
  lot?: string;
  note?: string;
}): Promise<Dataset> {
  const form = new FormData();
  form.append("file", file, file.name);
  // the production lot and a note travel beside the file (both optional)
  if (lot?.trim()) form.append("lot", lot.trim());
  if (note?.trim()) form.append("note", note.trim());
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
