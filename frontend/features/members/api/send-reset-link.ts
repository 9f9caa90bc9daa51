import { useMutation } from "@tanstack/react-query";
import { ResetLinkSentSchema } from "@shared/schemas/api";
import { api } from "@frontend/lib/api-client";

/** An admin sends a member a link to set a new password (the link goes only to the member). */
export function useSendResetLink() {
  return useMutation({
    mutationFn: (memberId: string) => api.post(`/api/members/${encodeURIComponent(memberId)}/reset-link`, {}, ResetLinkSentSchema),
  });
}
