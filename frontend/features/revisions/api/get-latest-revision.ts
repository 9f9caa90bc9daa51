import { useQueryClient } from "@tanstack/react-query";
import { useCallback } from "react";
import type { Revision } from "@shared/schemas/revisions";
import { revisionQueryOptions } from "./get-revision";

/** Fetches a revision as the server has it now (never from the cache), and keeps it in the cache. */
export function useLatestRevision() {
  const queryClient = useQueryClient();
  return useCallback(
    (id: string): Promise<Revision> => queryClient.fetchQuery({ ...revisionQueryOptions(id), staleTime: 0 }),
    [queryClient],
  );
}
