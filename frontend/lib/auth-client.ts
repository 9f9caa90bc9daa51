import { createAuthClient } from "better-auth/react";

// Same origin in every mode: the API server also serves the client (Vite in middleware
// during development), so better-auth's origin check passes without extra set-up.
export const authClient = createAuthClient({
  baseURL: `${window.location.origin}/api/auth`,
  fetchOptions: {
    // better-auth keeps the `fetch` it saw at start-up; look it up per call instead, as
    // our API client does, so a test double sees sign-in calls too.
    customFetchImpl: (input, init) => globalThis.fetch(input, init),
  },
});
