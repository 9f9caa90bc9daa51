import { useMutation, useQueryClient } from "@tanstack/react-query";
import { authClient } from "@frontend/lib/auth-client";
import { ApiError } from "@frontend/lib/api-client";
import { authKeys } from "./keys";

export type SignInInput = { email: string; password: string };

/** better-auth answers `{ data, error }`; turn its error into our ApiError with a plain message. */
export async function signIn(input: SignInInput): Promise<void> {
  const { error } = await authClient.signIn.email({ email: input.email, password: input.password });
  if (!error) return;
  const status = error.status ?? 0;
  if (status === 429) {
    throw new ApiError(429, "rate_limited", "Too many sign-in attempts. Wait a minute, then try again.");
  }
  if (status === 401 || status === 403 || error.code === "INVALID_EMAIL_OR_PASSWORD") {
    throw new ApiError(status || 401, "invalid_credentials", "That e-mail address and password do not match an account.");
  }
  if (status === 400) {
    throw new ApiError(400, error.code ?? "bad_request", error.message ?? "Check the e-mail address and password.");
  }
  throw new ApiError(status, error.code ?? "sign_in_failed", "Signing in failed. Try again shortly.");
}

export function useSignIn() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    onSuccess: async () => {
      // A previous user's data must never show for the next one.
      queryClient.clear();
      await queryClient.invalidateQueries({ queryKey: authKeys.me() });
    },
  });
}
