import { useMutation, useQueryClient } from "@tanstack/react-query";
import { authClient } from "@frontend/lib/auth-client";
import { ApiError } from "@frontend/lib/api-client";

export async function signOut(): Promise<void> {
  const { error } = await authClient.signOut();
  if (error) throw new ApiError(error.status ?? 0, error.code ?? "sign_out_failed", "Signing out failed. Try again.");
}

export function useSignOut() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signOut,
    onSettled: () => queryClient.clear(),
  });
}
