import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { Report } from "@shared/schemas/reports";
import { api } from "@frontend/lib/api-client";
import { refreshAfter } from "./invalidate";
import { reportKeys } from "./keys";

export function deleteReport(report: Pick<Report, "id" | "projectId">): Promise<void> {
  return api.delete(`/api/reports/${encodeURIComponent(report.id)}`);
}

/** Discards a draft. */
export function useDeleteReport() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deleteReport,
    onSuccess: (_void, report) => {
      queryClient.removeQueries({ queryKey: reportKeys.detail(report.id) });
      return refreshAfter(queryClient, report);
    },
  });
}
