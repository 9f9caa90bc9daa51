import { useMutation, useQueryClient } from "@tanstack/react-query";
import type * as z from "zod";
import { RevisionSchema, type Revision, type UpdateRevisionSchema } from "@shared/schemas/revisions";
import { api } from "@frontend/lib/api-client";
import { revisionKeys } from "./keys";

/** `version`: the version the changes were made on; a stale one is refused with a 409 `conflict`. */
export type UpdateRevisionInput = { id: string; version: number; changes: z.input<typeof UpdateRevisionSchema> };

export function updateRevision({ id, version, changes }: UpdateRevisionInput): Promise<Revision> {
  return api.patch(`/api/revisions/${encodeURIComponent(id)}`, changes, RevisionSchema, version);
}

/** The editor's autosave. The answer goes into the cache; the editor keeps its own document. */
export function useUpdateRevision() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateRevision,
    onSuccess: (revision) => {
      queryClient.setQueryData(revisionKeys.detail(revision.id), revision);
      return queryClient.invalidateQueries({ queryKey: revisionKeys.list(revision.projectId) });
    },
  });
}
