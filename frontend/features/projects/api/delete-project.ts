import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api, withQuery } from "@frontend/lib/api-client";
import { projectKeys } from "./keys";

/** `confirm`: the project's name, which an admin types to delete one holding kept records. */
export function deleteProject({ id, confirm }: { id: string; confirm?: string }): Promise<void> {
  return api.delete(withQuery(`/api/projects/${encodeURIComponent(id)}`, { confirm }));
}

export function useDeleteProject() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deleteProject,
    onSuccess: (_void, { id }) => {
      queryClient.removeQueries({ queryKey: projectKeys.detail(id) });
      return Promise.all([
        queryClient.invalidateQueries({ queryKey: projectKeys.lists() }),
        queryClient.invalidateQueries({ queryKey: ["review-queue"] }),
      ]);
    },
  });
}
