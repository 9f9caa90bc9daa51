import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "@frontend/lib/api-client";
import { memberKeys } from "./keys";

export function revokeInvitation(id: string): Promise<void> {
  return api.delete(`/api/invitations/${encodeURIComponent(id)}`);
}

export function useRevokeInvitation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: revokeInvitation,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: memberKeys.invitations() }),
  });
}
