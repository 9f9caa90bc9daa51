import { queryOptions, useQuery } from "@tanstack/react-query";
import { InvitationListSchema, type Invitation } from "@shared/schemas/api";
import { api } from "@frontend/lib/api-client";
import { memberKeys } from "./keys";

export async function getInvitations(signal?: AbortSignal): Promise<Invitation[]> {
  const { invitations } = await api.get("/api/invitations", InvitationListSchema, signal);
  return invitations;
}

export const invitationsQueryOptions = () =>
  queryOptions({
    queryKey: memberKeys.invitations(),
    queryFn: ({ signal }) => getInvitations(signal),
  });

export function useInvitations() {
  return useQuery(invitationsQueryOptions());
}
