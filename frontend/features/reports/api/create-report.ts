import { useMutation, useQueryClient } from "@tanstack/react-query";
import type * as z from "zod";
import { ReportSchema, type CreateReportSchema, type Report } from "@shared/schemas/reports";
import { api } from "@frontend/lib/api-client";
import { refreshAfter } from "./invalidate";
import { reportKeys } from "./keys";

export type CreateReportInput = { studyId: string; body: z.input<typeof CreateReportSchema> };

export function createReport({ studyId, body }: CreateReportInput): Promise<Report> {
  return api.post(`/api/studies/${encodeURIComponent(studyId)}/reports`, body, ReportSchema);
}

export function useCreateReport() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createReport,
    onSuccess: (report) => {
      queryClient.setQueryData(reportKeys.detail(report.id), report);
      return refreshAfter(queryClient, report);
    },
  });
}
