import { useMutation, useQueryClient } from "@tanstack/react-query";
import { ProjectSchema, type CreateProject, type Project } from "@shared/schemas/api";
import { api } from "@frontend/lib/api-client";
import { projectKeys } from "./keys";

export function createProject(input: CreateProject): Promise<Project> {
  return api.post("/api/projects", input, ProjectSchema);
}

export function useCreateProject() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createProject,
    onSuccess: (project) => {
      queryClient.setQueryData(projectKeys.detail(project.id), project);
      return queryClient.invalidateQueries({ queryKey: projectKeys.lists() });
    },
  });
}
