import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { RevisionSchema, type Revision } from "@shared/schemas/revisions";
import { api } from "@frontend/lib/api-client";
import { revisionKeys } from "./keys";

export function getRevision(id: string, signal?: AbortSignal): Promise<Revision> {
  return api.get(`/api/revisions/${encodeURIComponent(id)}`, RevisionSchema, signal);
}

export const revisionQueryOptions = (id: string) =>
  queryOptions({
    queryKey: revisionKeys.detail(id),
    queryFn: ({ signal }) => getRevision(id, signal),
  });

/** One revision with its stack, requirements and comments; the route's loader has fetched it. */
export function useRevision(id: string) {
  return useSuspenseQuery(revisionQueryOptions(id));
}
