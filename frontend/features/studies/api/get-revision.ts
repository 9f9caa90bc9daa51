import { queryOptions, useQuery } from "@tanstack/react-query";
import { RevisionSchema, type Revision } from "@shared/schemas/revisions";
import { api } from "@frontend/lib/api-client";
import { studyKeys } from "./keys";

export function getRevision(id: string, signal?: AbortSignal): Promise<Revision> {
  return api.get(`/api/revisions/${encodeURIComponent(id)}`, RevisionSchema, signal);
}

export const revisionQueryOptions = (id: string) =>
  queryOptions({
    queryKey: studyKeys.revision(id),
    queryFn: ({ signal }) => getRevision(id, signal),
  });

/** A revision's stack and requirements, for the study settings form. */
export function useRevision(id: string | null) {
  return useQuery({ ...revisionQueryOptions(id ?? ""), enabled: !!id });
}
