import { useMutation, useQueryClient } from "@tanstack/react-query";
import { RevisionSchema, type Revision } from "@shared/schemas/revisions";
import { api } from "@frontend/lib/api-client";
import { onRevisionChanged } from "./on-revision-changed";

export function submitRevision({ id, version }: { id: string; version: number }): Promise<Revision> {
  return api.post(`/api/revisions/${encodeURIComponent(id)}/submit`, undefined, RevisionSchema, version);
}

export function useSubmitRevision() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: submitRevision, onSuccess: (revision) => onRevisionChanged(queryClient, revision) });
}
