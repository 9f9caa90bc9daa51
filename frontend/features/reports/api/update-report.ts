import { useMutation, useQueryClient } from "@tanstack/react-query";
import type * as z from "zod";
import { ReportSchema, type Report, type UpdateReportSchema } from "@shared/schemas/reports";
import { api } from "@frontend/lib/api-client";
import { refreshAfter } from "./invalidate";
import { reportKeys } from "./keys";

export function updateReport({
  id,
  version,
  changes,
}: {
  id: string;
  version: number;
  changes: z.input<typeof UpdateReportSchema>;
}): Promise<Report> {
  return api.patch(`/api/reports/${encodeURIComponent(id)}`, changes, ReportSchema, version);
}

export function useUpdateReport() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateReport,
    onSuccess: (report) => {
      queryClient.setQueryData(reportKeys.detail(report.id), report);
      return refreshAfter(queryClient, report);
    },
  });
}
