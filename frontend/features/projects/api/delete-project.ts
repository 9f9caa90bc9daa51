import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "@frontend/lib/api-client";
import { projectKeys } from "./keys";

export function deleteProject(id: string): Promise<void> {
  return api.delete(`/api/projects/${encodeURIComponent(id)}`);
}

export function useDeleteProject() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deleteProject,
    onSuccess: (_void, id) => {
      queryClient.removeQueries({ queryKey: projectKeys.detail(id) });
      return queryClient.invalidateQueries({ queryKey: projectKeys.lists() });
    },
  });
}
