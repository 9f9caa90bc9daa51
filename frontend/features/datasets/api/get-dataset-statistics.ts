import { keepPreviousData, queryOptions, useQuery } from "@tanstack/react-query";
import { DatasetStatisticsSchema, type DatasetStatistics } from "@shared/schemas/datasets";
import { api, withQuery } from "@frontend/lib/api-client";
import { datasetKeys } from "./keys";

export function getDatasetStatistics(id: string, column: string, signal?: AbortSignal): Promise<DatasetStatistics> {
  return api.get(withQuery(`/api/datasets/${encodeURIComponent(id)}/statistics`, { column }), DatasetStatisticsSchema, signal);
}

export const datasetStatisticsQueryOptions = (id: string, column: string) =>
  queryOptions({
    queryKey: datasetKeys.statistics(id, column),
    queryFn: ({ signal }) => getDatasetStatistics(id, column, signal),
  });

/** Summary, normality, capability, outliers and histogram of one column; the last answer stays while the next loads. */
export function useDatasetStatistics(id: string, column: string | null) {
  return useQuery({ ...datasetStatisticsQueryOptions(id, column ?? ""), enabled: !!column, placeholderData: keepPreviousData });
}
