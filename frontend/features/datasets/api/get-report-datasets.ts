import { queryOptions, useQuery } from "@tanstack/react-query";
import { DatasetListSchema, type DatasetSummary } from "@shared/schemas/datasets";
import { api } from "@frontend/lib/api-client";
import { datasetKeys } from "./keys";

export async function getReportDatasets(reportId: string, signal?: AbortSignal): Promise<DatasetSummary[]> {
  const { datasets } = await api.get(`/api/reports/${encodeURIComponent(reportId)}/datasets`, DatasetListSchema, signal);
  return datasets;
}

export const reportDatasetsQueryOptions = (reportId: string) =>
  queryOptions({
    queryKey: datasetKeys.report(reportId),
    queryFn: ({ signal }) => getReportDatasets(reportId, signal),
  });

export function useReportDatasets(reportId: string) {
  return useQuery(reportDatasetsQueryOptions(reportId));
}
