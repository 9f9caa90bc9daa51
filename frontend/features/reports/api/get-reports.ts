import { queryOptions, useQuery } from "@tanstack/react-query";
import { ReportListSchema, type ReportSummary } from "@shared/schemas/reports";
import { api, withQuery } from "@frontend/lib/api-client";
import { reportKeys } from "./keys";

export type ReportFilters = { projectId?: string; status?: "draft" | "released" };

export async function getReports(filters: ReportFilters, signal?: AbortSignal): Promise<ReportSummary[]> {
  const { reports } = await api.get(withQuery("/api/reports", filters), ReportListSchema, signal);
  return reports;
}

export const reportsQueryOptions = (filters: ReportFilters = {}) =>
  queryOptions({
    queryKey: reportKeys.list(filters),
    queryFn: ({ signal }) => getReports(filters, signal),
  });

export function useReports(filters: ReportFilters = {}) {
  return useQuery(reportsQueryOptions(filters));
}
