import { queryOptions, useQuery } from "@tanstack/react-query";
import { DatasetListSchema, type DatasetSummary } from "@shared/schemas/datasets";
import { api } from "@frontend/lib/api-client";
import { datasetKeys } from "./keys";

export async function getDatasets(projectId: string, signal?: AbortSignal): Promise<DatasetSummary[]> {
  const { datasets } = await api.get(`/api/projects/${encodeURIComponent(projectId)}/datasets`, DatasetListSchema, signal);
  return datasets;
}

export const datasetsQueryOptions = (projectId: string) =>
  queryOptions({
    queryKey: datasetKeys.list(projectId),
    queryFn: ({ signal }) => getDatasets(projectId, signal),
  });

/** The project's data sets, newest first (the panel shows its own loading state). */
export function useDatasets(projectId: string) {
  return useQuery(datasetsQueryOptions(projectId));
}
