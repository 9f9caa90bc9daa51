import { keepPreviousData, queryOptions, useQuery } from "@tanstack/react-query";
import { ProjectListSchema, type Project } from "@shared/schemas/api";
import { api, withQuery } from "@frontend/lib/api-client";
import { projectKeys, type ProjectShown } from "./keys";

export async function getProjects(q: string, signal?: AbortSignal, archived: ProjectShown = "open"): Promise<Project[]> {
  const { projects } = await api.get(
    withQuery("/api/projects", { q: q.trim(), archived: archived === "open" ? undefined : archived }),
    ProjectListSchema,
    signal,
  );
  return projects;
}

export const projectsQueryOptions = (q = "", archived: ProjectShown = "open") =>
  queryOptions({
    queryKey: projectKeys.list(q.trim(), archived),
    queryFn: ({ signal }) => getProjects(q, signal, archived),
  });

const IN_PROGRESS = new Set(["queued", "running"]);
const POLL_WHILE_RUNNING_MS = 5_000;

/**
 * Keeps the previous rows on screen while a new search runs, so the table does not
 * flash; asks again every few seconds while any project's last study is still going.
 */
export function useProjects(q: string, archived: ProjectShown = "open") {
  return useQuery({
    ...projectsQueryOptions(q, archived),
    placeholderData: keepPreviousData,
    refetchInterval: (query) =>
      query.state.data?.some((p) => p.lastStudy && IN_PROGRESS.has(p.lastStudy.status)) ? POLL_WHILE_RUNNING_MS : false,
  });
}
