import { useMutation, useQueryClient } from "@tanstack/react-query";
import { ReportSchema, type Report } from "@shared/schemas/reports";
import { api } from "@frontend/lib/api-client";
import { reportKeys } from "./keys";

export function acknowledgeReport({ id, version, comment }: { id: string; version: number; comment?: string }): Promise<Report> {
  return api.post(`/api/reports/${encodeURIComponent(id)}/acknowledge`, comment ? { comment } : {}, ReportSchema, version);
}

/** The supplier's acknowledgement (a supplier has no project activity to refresh). */
export function useAcknowledgeReport() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: acknowledgeReport,
    onSuccess: (report) => {
      queryClient.setQueryData(reportKeys.detail(report.id), report);
      return queryClient.invalidateQueries({ queryKey: reportKeys.lists() });
    },
  });
}
