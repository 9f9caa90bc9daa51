import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api, withQuery } from "@frontend/lib/api-client";
import { reloadOnConflict } from "@frontend/lib/query-client";
import { projectKeys } from "./keys";

/** `version`: the one last read (a stale one is a 409); `confirm`: the project's name, which an admin types to delete one holding kept records. */
export function deleteProject({ id, version, confirm }: { id: string; version: number; confirm?: string }): Promise<void> {
  return api.delete(withQuery(`/api/projects/${encodeURIComponent(id)}`, { confirm }), version);
}

export function useDeleteProject() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deleteProject,
    onError: (error, { id }) => reloadOnConflict(queryClient, error, projectKeys.detail(id), projectKeys.lists()),
    onSuccess: (_void, { id }) => {
      queryClient.removeQueries({ queryKey: projectKeys.detail(id) });
      return Promise.all([
        queryClient.invalidateQueries({ queryKey: projectKeys.lists() }),
        queryClient.invalidateQueries({ queryKey: ["review-queue"] }),
      ]);
    },
  });
}
