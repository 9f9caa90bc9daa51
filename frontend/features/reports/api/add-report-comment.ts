import { useMutation, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import type { Report } from "@shared/schemas/reports";
import { CommentSchema } from "@shared/schemas/revisions";
import { api } from "@frontend/lib/api-client";
import { reportKeys } from "./keys";

const CommentsSchema = z.object({ comments: z.array(CommentSchema) });

export async function addReportComment({ id, body }: { id: string; body: string }) {
  const { comments } = await api.post(`/api/reports/${encodeURIComponent(id)}/comments`, { body }, CommentsSchema);
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
