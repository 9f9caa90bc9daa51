import { queryOptions, useQuery } from "@tanstack/react-query";
import { RevisionListSchema, type RevisionSummary } from "@shared/schemas/revisions";
import { api } from "@frontend/lib/api-client";
import { studyKeys } from "./keys";

export async function getProjectRevisions(projectId: string, signal?: AbortSignal): Promise<RevisionSummary[]> {
  const { revisions } = await api.get(`/api/projects/${encodeURIComponent(projectId)}/revisions`, RevisionListSchema, signal);
  return revisions;
}

export const projectRevisionsQueryOptions = (projectId: string) =>
  queryOptions({
    queryKey: studyKeys.revisions(projectId),
    queryFn: ({ signal }) => getProjectRevisions(projectId, signal),
  });

export function useProjectRevisions(projectId: string) {
  return useQuery(projectRevisionsQueryOptions(projectId));
}
