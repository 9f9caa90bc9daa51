import { useMutation, useQueryClient } from "@tanstack/react-query";
import { ProjectSchema, type Project } from "@shared/schemas/api";
import { api } from "@frontend/lib/api-client";
import { reloadOnConflict } from "@frontend/lib/query-client";
import { projectKeys } from "./keys";

/** Archives (read-only, out of the default list) or restores a project, on the version last read. */
export function setProjectArchived({ id, version, archived }: { id: string; version: number; archived: boolean }): Promise<Project> {
  return api.post(`/api/projects/${encodeURIComponent(id)}/${archived ? "archive" : "restore"}`, {}, ProjectSchema, version);
}

export function useSetProjectArchived() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: setProjectArchived,
    onError: (error, { id }) => reloadOnConflict(queryClient, error, projectKeys.detail(id), projectKeys.lists()),
    onSuccess: (project) => {
      queryClient.setQueryData(projectKeys.detail(project.id), project);
      return Promise.all([
        queryClient.invalidateQueries({ queryKey: projectKeys.lists() }),
        queryClient.invalidateQueries({ queryKey: projectKeys.activity(project.id) }),
        // an archived project's work waits for nobody (the home page and the counts)
        queryClient.invalidateQueries({ queryKey: ["review-queue"] }),
      ]);
    },
  });
}
