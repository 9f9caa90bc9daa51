import { keepPreviousData, queryOptions, useQuery } from "@tanstack/react-query";
import { ProjectListSchema, type Project } from "@shared/schemas/api";
import { api, withQuery } from "@frontend/lib/api-client";
import { projectKeys } from "./keys";

export async function getProjects(q: string, signal?: AbortSignal): Promise<Project[]> {
  const { projects } = await api.get(withQuery("/api/projects", { q: q.trim() }), ProjectListSchema, signal);
  return projects;
}

export const projectsQueryOptions = (q = "") =>
  queryOptions({
    queryKey: projectKeys.list(q.trim()),
    queryFn: ({ signal }) => getProjects(q, signal),
  });

/** Keeps the previous rows on screen while a new search runs, so the table does not flash. */
export function useProjects(q: string) {
  return useQuery({ ...projectsQueryOptions(q), placeholderData: keepPreviousData });
}
