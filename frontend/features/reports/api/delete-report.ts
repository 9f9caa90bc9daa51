import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { Report } from "@shared/schemas/reports";
import { api } from "@frontend/lib/api-client";
import { reloadOnConflict } from "@frontend/lib/query-client";
import { refreshAfter } from "./invalidate";
import { reportKeys } from "./keys";

/** On the version last read: a draft someone else changed meanwhile is a 409, and is kept. */
export function deleteReport(report: Pick<Report, "id" | "projectId" | "version">): Promise<void> {
  return api.delete(`/api/reports/${encodeURIComponent(report.id)}`, report.version);
}

/** Discards a draft. */
export function useDeleteReport() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deleteReport,
    onError: (error, report) => reloadOnConflict(queryClient, error, reportKeys.detail(report.id)),
    onSuccess: (_void, report) => {
      queryClient.removeQueries({ queryKey: reportKeys.detail(report.id) });
      return refreshAfter(queryClient, report);
    },
  });
}
