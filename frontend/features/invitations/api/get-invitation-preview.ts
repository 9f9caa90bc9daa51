import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { InvitationPreviewSchema } from "@shared/schemas/api";
import type * as z from "zod";
import { api } from "@frontend/lib/api-client";
import { invitationKeys } from "./keys";

export type InvitationPreview = z.infer<typeof InvitationPreviewSchema>;

export function getInvitationPreview(token: string, signal?: AbortSignal): Promise<InvitationPreview> {
  return api.get(`/api/invitations/by-token/${encodeURIComponent(token)}`, InvitationPreviewSchema, signal);
}

export const invitationPreviewQueryOptions = (token: string) =>
  queryOptions({
    queryKey: invitationKeys.byToken(token),
    queryFn: ({ signal }) => getInvitationPreview(token, signal),
    staleTime: Infinity,
  });

export function useInvitationPreview(token: string) {
  return useSuspenseQuery(invitationPreviewQueryOptions(token));
}
