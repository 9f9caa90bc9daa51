import { queryOptions, useQuery } from "@tanstack/react-query";
import { ReportOptionsSchema, type ReportOptions } from "@shared/schemas/reports";
import { api } from "@frontend/lib/api-client";
import { reportKeys } from "./keys";

/** The project's studies with, for each, whether a report can be built and for which suppliers. */
export function getReportOptions(projectId: string, signal?: AbortSignal): Promise<ReportOptions> {
  return api.get(`/api/projects/${encodeURIComponent(projectId)}/report-options`, ReportOptionsSchema, signal);
}

export const reportOptionsQueryOptions = (projectId: string) =>
  queryOptions({
    queryKey: reportKeys.options(projectId),
    queryFn: ({ signal }) => getReportOptions(projectId, signal),
  });

export function useReportOptions(projectId: string, enabled = true) {
  return useQuery({ ...reportOptionsQueryOptions(projectId), enabled });
}
