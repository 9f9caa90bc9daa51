import { queryOptions, useQuery } from "@tanstack/react-query";
import { RevisionListSchema, type RevisionSummary } from "@shared/schemas/revisions";
import { api } from "@frontend/lib/api-client";
import { revisionKeys } from "./keys";

export async function getRevisions(projectId: string, signal?: AbortSignal): Promise<RevisionSummary[]> {
  const { revisions } = await api.get(`/api/projects/${encodeURIComponent(projectId)}/revisions`, RevisionListSchema, signal);
  return revisions;
}

export const revisionsQueryOptions = (projectId: string) =>
  queryOptions({
    queryKey: revisionKeys.list(projectId),
    queryFn: ({ signal }) => getRevisions(projectId, signal),
  });

export function useRevisions(projectId: string) {
  return useQuery(revisionsQueryOptions(projectId));
}
