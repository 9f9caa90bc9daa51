import { useQuery } from "@tanstack/react-query";
import { RevisionCheckSchema } from "@shared/schemas/revisions";
import { api } from "@frontend/lib/api-client";
import { revisionKeys } from "./keys";

/** How the revision meets its requirements (its study of this stack, else the live estimate). */
export function useRequirementCheck(id: string, version: number, enabled = true) {
  return useQuery({
    // keyed on the version: any change of the draft asks again
    queryKey: [...revisionKeys.detail(id), "requirement-check", version],
    queryFn: ({ signal }) => api.get(`/api/revisions/${encodeURIComponent(id)}/requirement-check`, RevisionCheckSchema, signal),
    enabled,
    staleTime: 0,
  });
}
