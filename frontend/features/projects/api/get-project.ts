import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { ProjectSchema, type Project } from "@shared/schemas/api";
import { api } from "@frontend/lib/api-client";
import { projectKeys } from "./keys";

export function getProject(id: string, signal?: AbortSignal): Promise<Project> {
  return api.get(`/api/projects/${encodeURIComponent(id)}`, ProjectSchema, signal);
}

export const projectQueryOptions = (id: string) =>
  queryOptions({
    queryKey: projectKeys.detail(id),
    queryFn: ({ signal }) => getProject(id, signal),
  });

export function useProject(id: string) {
  return useSuspenseQuery(projectQueryOptions(id));
}
