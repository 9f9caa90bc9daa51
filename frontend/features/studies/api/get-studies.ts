import { queryOptions, useQuery } from "@tanstack/react-query";
import { StudyListSchema, type StudySummary } from "@shared/schemas/studies";
import { api } from "@frontend/lib/api-client";
import { ACTIVE } from "./get-study";
import { studyKeys } from "./keys";

export async function getStudies(projectId: string, signal?: AbortSignal): Promise<StudySummary[]> {
  const { studies } = await api.get(`/api/projects/${encodeURIComponent(projectId)}/studies`, StudyListSchema, signal);
  return studies;
}

const POLL_LIST_MS = 2000;

export const studiesQueryOptions = (projectId: string) =>
  queryOptions({
    queryKey: studyKeys.list(projectId),
    queryFn: ({ signal }) => getStudies(projectId, signal),
  });

/** The project's studies, newest first; asked again every two seconds while one is queued or running. */
export function useStudies(projectId: string) {
  return useQuery({
    ...studiesQueryOptions(projectId),
    refetchInterval: (query) => (query.state.data?.some((s) => ACTIVE.has(s.status)) ? POLL_LIST_MS : false),
  });
}
