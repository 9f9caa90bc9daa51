import { useMutation, useQueryClient } from "@tanstack/react-query";
import { RevisionSchema, type Revision } from "@shared/schemas/revisions";
import { api } from "@frontend/lib/api-client";
import { onRevisionChanged } from "./on-revision-changed";

export function approveRevision({ id, version, comment }: { id: string; version: number; comment?: string }): Promise<Revision> {
  return api.post(`/api/revisions/${encodeURIComponent(id)}/approve`, comment ? { comment } : undefined, RevisionSchema, version);
}

export function useApproveRevision() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: approveRevision, onSuccess: (revision) => onRevisionChanged(queryClient, revision) });
}
