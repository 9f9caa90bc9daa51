import { useMutation, useQueryClient } from "@tanstack/react-query";
import type * as z from "zod";
import { InvitationSchema, type CreateInvitationSchema, type Invitation } from "@shared/schemas/api";
import { api } from "@frontend/lib/api-client";
import { memberKeys } from "./keys";

export type CreateInvitation = z.infer<typeof CreateInvitationSchema>;

export function createInvitation(input: CreateInvitation): Promise<Invitation> {
  return api.post("/api/invitations", input, InvitationSchema);
}

export function useCreateInvitation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createInvitation,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: memberKeys.invitations() }),
  });
}
