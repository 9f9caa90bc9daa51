import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { ReportSchema, type Report } from "@shared/schemas/reports";
import { api } from "@frontend/lib/api-client";
import { reportKeys } from "./keys";

export function getReport(id: string, signal?: AbortSignal): Promise<Report> {
  return api.get(`/api/reports/${encodeURIComponent(id)}`, ReportSchema, signal);
}

export const reportQueryOptions = (id: string) =>
  queryOptions({
    queryKey: reportKeys.detail(id),
    queryFn: ({ signal }) => getReport(id, signal),
  });

export function useReport(id: string) {
  return useSuspenseQuery(reportQueryOptions(id));
}
