import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { DatasetSchema, type Dataset } from "@shared/schemas/datasets";
import { api } from "@frontend/lib/api-client";
import { datasetKeys } from "./keys";

export function getDataset(id: string, signal?: AbortSignal): Promise<Dataset> {
  return api.get(`/api/datasets/${encodeURIComponent(id)}`, DatasetSchema, signal);
}

export const datasetQueryOptions = (id: string) =>
  queryOptions({
    queryKey: datasetKeys.detail(id),
    queryFn: ({ signal }) => getDataset(id, signal),
  });

export function useDataset(id: string) {
  return useSuspenseQuery(datasetQueryOptions(id));
}
