import { useMutation, useQueryClient } from "@tanstack/react-query";
import { CommentListSchema, type Revision } from "@shared/schemas/revisions";
import { projectKeys } from "@frontend/features/projects";
import { api } from "@frontend/lib/api-client";
import { revisionKeys } from "./keys";

export async function addRevisionComment({ id, body }: { id: string; body: string }) {
  const { comments } = await api.post(`/api/revisions/${encodeURIComponent(id)}/comments`, { body }, CommentListSchema);
  return comments;
}

export function useAddRevisionComment(revision: Pick<Revision, "id" | "projectId">) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: addRevisionComment,
    onSuccess: (comments) => {
      queryClient.setQueryData<Revision>(revisionKeys.detail(revision.id), (old) => (old ? { ...old, comments } : old));
      return queryClient.invalidateQueries({ queryKey: projectKeys.activity(revision.projectId) });
    },
  });
}
