import { queryOptions, useQuery } from "@tanstack/react-query";
import { StudySchema, type Study, type StudyStatus } from "@shared/schemas/studies";
import { api } from "@frontend/lib/api-client";
import { studyKeys } from "./keys";

/** The study as the client reads it (shared/schemas/studies StudySchema: study file, stack and result typed). */
export type StudyDetail = Study;

export function getStudy(id: string, signal?: AbortSignal): Promise<StudyDetail> {
  return api.get(`/api/studies/${encodeURIComponent(id)}`, StudySchema, signal);
}

export const ACTIVE: ReadonlySet<StudyStatus> = new Set(["queued", "running"]);
/** Progress is written by the queue about twice a second; once a second on screen is enough. */
export const POLL_ACTIVE_MS = 1000;

export const studyQueryOptions = (id: string) =>
  queryOptions({
    queryKey: studyKeys.detail(id),
    queryFn: ({ signal }) => getStudy(id, signal),
    // A finished study never changes; a running one is asked again every second.
    staleTime: (query) => (query.state.data && !ACTIVE.has(query.state.data.status) ? Infinity : 0),
    refetchInterval: (query) => (query.state.data && ACTIVE.has(query.state.data.status) ? POLL_ACTIVE_MS : false),
  });

export function useStudy(id: string | null | undefined) {
  return useQuery({ ...studyQueryOptions(id ?? ""), enabled: !!id });
}
