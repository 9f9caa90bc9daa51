import { useMutation, useQueryClient } from "@tanstack/react-query";
import { DatasetSchema, type Dataset } from "@shared/schemas/datasets";
import { apiRequest } from "@frontend/lib/api-client";
import { datasetKeys } from "./keys";

/** A supplier sends the measurements a released report asks for. */
export function uploadReportDataset({
  reportId,
  file,
  lot,
  note,
}: {
  reportId: string;
  file: File;
  lot?: string;
  note?: string;
}): Promise<Dataset> {
  const form = new FormData();
  form.append("file", file, file.name);
  // the production lot and a note travel beside the file (both optional)
  if (lot?.trim()) form.append("lot", lot.trim());
  if (note?.trim()) form.append("note", note.trim());
  return apiRequest(`/api/reports/${encodeURIComponent(reportId)}/datasets`, DatasetSchema, { method: "POST", body: form });
}

export function useUploadReportDataset() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: uploadReportDataset,
    onSuccess: (dataset, { reportId }) =>
      Promise.all([
        queryClient.invalidateQueries({ queryKey: datasetKeys.report(reportId) }),
        queryClient.invalidateQueries({ queryKey: datasetKeys.list(dataset.projectId) }),
      ]),
  });
}
