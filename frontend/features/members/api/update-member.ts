import { useMutation, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { MemberSchema, type Member, type UpdateMemberSchema } from "@shared/schemas/api";
import { api } from "@frontend/lib/api-client";
import { memberKeys } from "./keys";

export type UpdateMember = z.infer<typeof UpdateMemberSchema>;

// The contract names no answer body for this PATCH; the list is refetched either way,
// so accept any JSON and use it only when it is the member.
const UpdateMemberResponseSchema = z.unknown();

export async function updateMember({ id, changes }: { id: string; changes: UpdateMember }): Promise<Member | undefined> {
  const answer = await api.patch(`/api/members/${encodeURIComponent(id)}`, changes, UpdateMemberResponseSchema);
  const parsed = MemberSchema.safeParse(answer);
  return parsed.success ? parsed.data : undefined;
}

export function useUpdateMember() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateMember,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: memberKeys.list() }),
  });
}
