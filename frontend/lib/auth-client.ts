import { createAuthClient } from "better-auth/react";

// Same origin in every mode: the API server also serves the client (Vite in middleware
// during development), so better-auth's origin check passes without extra set-up.
export const authClient = createAuthClient({
  baseURL: `${window.location.origin}/api/auth`,
});
