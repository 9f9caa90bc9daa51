import { queryOptions, useQuery } from "@tanstack/react-query";
import { MemberListSchema, type Member } from "@shared/schemas/api";
import { api } from "@frontend/lib/api-client";
import { memberKeys } from "./keys";

export async function getMembers(signal?: AbortSignal): Promise<Member[]> {
  const { members } = await api.get("/api/members", MemberListSchema, signal);
  return members;
}

export const membersQueryOptions = () =>
  queryOptions({
    queryKey: memberKeys.list(),
    queryFn: ({ signal }) => getMembers(signal),
  });

export function useMembers() {
  return useQuery(membersQueryOptions());
}
