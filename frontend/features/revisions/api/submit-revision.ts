import { useMutation, useQueryClient } from "@tanstack/react-query";
import { RevisionSchema, type Revision } from "@shared/schemas/revisions";
import { api } from "@frontend/lib/api-client";
import { onRevisionChanged } from "./on-revision-changed";

export type SubmitRevisionInput = {
  id: string;
  version: number;
  /** what changed and why (asked for on every revision after the first) */
  note?: string;
  /** the engineer has seen which requirements fail and submits anyway */
  confirmFailing?: boolean;
};

export function submitRevision({ id, version, note, confirmFailing }: SubmitRevisionInput): Promise<Revision> {
  return api.post(`/api/revisions/${encodeURIComponent(id)}/submit`, { note, confirmFailing }, RevisionSchema, version);
}

export function useSubmitRevision() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: submitRevision, onSuccess: (revision) => onRevisionChanged(queryClient, revision) });
}
