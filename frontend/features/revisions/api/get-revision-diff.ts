import { useQuery } from "@tanstack/react-query";
import { RevisionDiffSchema } from "@shared/schemas/revisions";
import { api } from "@frontend/lib/api-client";
import { revisionKeys } from "./keys";

/** What changed from the revision before (or `against`), labelled and with units. */
export function useRevisionDiff(id: string, updatedAt: string, against?: string) {
  return useQuery({
    // keyed on the revision's last change, so an edited draft shows its new changes
    queryKey: [...revisionKeys.detail(id), "diff", against ?? "previous", updatedAt],
    queryFn: ({ signal }) =>
      api.get(
        `/api/revisions/${encodeURIComponent(id)}/diff${against ? `?against=${encodeURIComponent(against)}` : ""}`,
        RevisionDiffSchema,
        signal,
      ),
  });
}
