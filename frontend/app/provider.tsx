import { useState, type ReactNode } from "react";
import { QueryClientProvider } from "@tanstack/react-query";
import { createQueryClient } from "@frontend/lib/query-client";

function signInAgain() {
  const here = window.location.pathname + window.location.search;
  if (window.location.pathname.startsWith("/sign-in") || window.location.pathname.startsWith("/invite/")) return;
  window.location.assign(`/sign-in?next=${encodeURIComponent(here)}`);
}

export function useAppQueryClient() {
  const [queryClient] = useState(() => createQueryClient({ onUnauthorized: signInAgain }));
  return queryClient;
}

export function AppProvider({ queryClient, children }: { queryClient: ReturnType<typeof createQueryClient>; children: ReactNode }) {
  return <QueryClientProvider client={queryClient}>{children}</QueryClientProvider>;
}
