import { useMutation, useQueryClient } from "@tanstack/react-query";
import { ApiError } from "@frontend/lib/api-client";
import { authClient } from "@frontend/lib/auth-client";
import { authKeys } from "./keys";

type AuthError = { status?: number; code?: string; message?: string } | null;

/** better-auth's client answers { error } instead of throwing; the app's forms expect an ApiError. */
function raise(error: AuthError, fallback: string): never {
  throw new ApiError(error?.status ?? 0, error?.code ?? "auth_failed", error?.message || fallback);
}

/** Changes the signed-in person's password; the server ends their other sessions. */
export function useChangePassword() {
  return useMutation({
    mutationFn: async (input: { currentPassword: string; newPassword: string }) => {
      const { error } = await authClient.changePassword({ ...input, revokeOtherSessions: true });
      if (error) raise(error, "The password could not be changed.");
    },
  });
}

/** Sets a new password from the token of a reset link; every session of the account ends. */
export function useResetPassword() {
  return useMutation({
    mutationFn: async (input: { token: string; newPassword: string }) => {
      const { error } = await authClient.resetPassword(input);
      if (error) raise(error, "This link cannot be used any more. Ask your admin for a new one.");
    },
  });
}

/** Changes the signed-in person's own name. */
export function useUpdateName() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: async (name: string) => {
      const { error } = await authClient.updateUser({ name });
      if (error) raise(error, "The name could not be saved.");
    },
    onSuccess: () => queryClient.invalidateQueries({ queryKey: authKeys.me() }),
  });
}
