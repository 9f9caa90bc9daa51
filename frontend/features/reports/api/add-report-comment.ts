import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { Report } from "@shared/schemas/reports";
import { CommentListSchema } from "@shared/schemas/revisions";
import { api } from "@frontend/lib/api-client";
import { reportKeys } from "./keys";

export async function addReportComment({ id, body }: { id: string; body: string }) {
  const { comments } = await api.post(`/api/reports/${encodeURIComponent(id)}/comments`, { body }, CommentListSchema);
  return comments;
}

export function useAddReportComment() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: addReportComment,
    onSuccess: (comments, { id }) => {
      queryClient.setQueryData<Report>(reportKeys.detail(id), (r) => (r ? { ...r, comments } : r));
      return queryClient.invalidateQueries({ queryKey: reportKeys.detail(id) });
    },
  });
}
