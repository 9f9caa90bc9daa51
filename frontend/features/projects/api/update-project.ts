import { useMutation, useQueryClient } from "@tanstack/react-query";
import { ProjectSchema, type Project, type UpdateProject } from "@shared/schemas/api";
import { api } from "@frontend/lib/api-client";
import { projectKeys } from "./keys";

export function updateProject({ id, version, changes }: { id: string; version: number; changes: UpdateProject }): Promise<Project> {
  return api.patch(`/api/projects/${encodeURIComponent(id)}`, changes, ProjectSchema, version);
}

export function useUpdateProject() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateProject,
    onSuccess: (project) => {
      queryClient.setQueryData(projectKeys.detail(project.id), project);
      return Promise.all([
        queryClient.invalidateQueries({ queryKey: projectKeys.lists() }),
        queryClient.invalidateQueries({ queryKey: projectKeys.activity(project.id) }),
      ]);
    },
  });
}
