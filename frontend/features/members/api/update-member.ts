import { useMutation, useQueryClient } from "@tanstack/react-query";
import type * as z from "zod";
import { MemberSchema, type Member, type UpdateMemberSchema } from "@shared/schemas/api";
import { api } from "@frontend/lib/api-client";
import { memberKeys } from "./keys";

export type UpdateMember = z.infer<typeof UpdateMemberSchema>;

export function updateMember({ id, changes }: { id: string; changes: UpdateMember }): Promise<Member> {
  return api.patch(`/api/members/${encodeURIComponent(id)}`, changes, MemberSchema);
}

export function useUpdateMember() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateMember,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: memberKeys.list() }),
  });
}
