import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "@frontend/lib/api-client";
import { memberKeys } from "./keys";

export function deleteMember(id: string): Promise<void> {
  return api.delete(`/api/members/${encodeURIComponent(id)}`);
}

export function useDeleteMember() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deleteMember,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: memberKeys.list() }),
  });
}
