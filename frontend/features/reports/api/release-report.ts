import { useMutation, useQueryClient } from "@tanstack/react-query";
import { ReportSchema, type Report } from "@shared/schemas/reports";
import { api } from "@frontend/lib/api-client";
import { refreshAfter } from "./invalidate";
import { reportKeys } from "./keys";

export function releaseReport({ id, version, comment }: { id: string; version: number; comment?: string }): Promise<Report> {
  return api.post(`/api/reports/${encodeURIComponent(id)}/release`, comment ? { comment } : {}, ReportSchema, version);
}

export function useReleaseReport() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: releaseReport,
    onSuccess: (report) => {
      queryClient.setQueryData(reportKeys.detail(report.id), report);
      return refreshAfter(queryClient, report);
    },
  });
}
