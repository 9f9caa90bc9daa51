import { useMutation, useQueryClient } from "@tanstack/react-query";
import { SendResultSchema, type SendReport, type SendResult } from "@shared/schemas/reports";
import { api } from "@frontend/lib/api-client";
import { refreshAfter } from "./invalidate";
import { reportKeys } from "./keys";

export function sendReport({ id, body }: { id: string; body: SendReport }): Promise<SendResult> {
  return api.post(`/api/reports/${encodeURIComponent(id)}/send`, body, SendResultSchema);
}

export function useSendReport() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: sendReport,
    onSuccess: (result) => {
      queryClient.setQueryData(reportKeys.detail(result.report.id), result.report);
      return Promise.all([refreshAfter(queryClient, result.report), queryClient.invalidateQueries({ queryKey: reportKeys.outbox() })]);
    },
  });
}
