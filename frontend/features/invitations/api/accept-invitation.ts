import { useMutation, useQueryClient } from "@tanstack/react-query";
import type * as z from "zod";
import { AcceptedInvitationSchema, type AcceptInvitationSchema } from "@shared/schemas/api";
import { api } from "@frontend/lib/api-client";
import { invitationKeys } from "./keys";

export type AcceptInvitation = z.infer<typeof AcceptInvitationSchema>;

export async function acceptInvitation({ token, input }: { token: string; input: AcceptInvitation }): Promise<void> {
  await api.post(`/api/invitations/by-token/${encodeURIComponent(token)}/accept`, input, AcceptedInvitationSchema);
}

export function useAcceptInvitation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: acceptInvitation,
    // The answer set a session cookie for the new member: forget whatever an earlier
    // session left in the cache. The invitation on screen stays; asking for it again
    // now would only say it has been used.
    onSuccess: () => queryClient.removeQueries({ predicate: (query) => query.queryKey[0] !== invitationKeys.all[0] }),
  });
}
