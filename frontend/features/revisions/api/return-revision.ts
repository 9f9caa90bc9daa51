import { useMutation, useQueryClient } from "@tanstack/react-query";
import { RevisionSchema, type Revision } from "@shared/schemas/revisions";
import { api } from "@frontend/lib/api-client";
import { onRevisionChanged } from "./on-revision-changed";

/** Sends an in-review revision back to draft, with the reviewer's reason. */
export function returnRevision({ id, version, comment }: { id: string; version: number; comment: string }): Promise<Revision> {
  return api.post(`/api/revisions/${encodeURIComponent(id)}/return`, { comment }, RevisionSchema, version);
}

export function useReturnRevision() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: returnRevision, onSuccess: (revision) => onRevisionChanged(queryClient, revision) });
}
