import { useMutation, useQueryClient } from "@tanstack/react-query";
import { ReportSchema, type Report } from "@shared/schemas/reports";
import { api } from "@frontend/lib/api-client";
import { refreshAfter } from "./invalidate";
import { reportKeys } from "./keys";

/** A reviewer sends a draft back to its engineer with a comment (it stays a draft). */
export function returnReport({ id, version, comment }: { id: string; version: number; comment: string }): Promise<Report> {
  return api.post(`/api/reports/${encodeURIComponent(id)}/return`, { comment }, ReportSchema, version);
}

export function useReturnReport() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: returnReport,
    onSuccess: (report) => {
      queryClient.setQueryData(reportKeys.detail(report.id), report);
      return refreshAfter(queryClient, report);
    },
  });
}
