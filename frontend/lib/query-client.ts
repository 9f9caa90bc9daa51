import { QueryCache, QueryClient, type QueryKey } from "@tanstack/react-query";
import { isApiError } from "./api-client";

/** A client error (4xx) will not get better by asking again; network and 5xx may. */
function shouldRetry(failureCount: number, error: unknown): boolean {
  if (isApiError(error) && error.status >= 400 && error.status < 500) return false;
  return failureCount < 2;
}

/**
 * After a 409 `conflict` (someone else changed the record since this page read it), the record's
 * queries are read again: the page shows their change, the server's message says so, and a second
 * try names the version just read. backend/lib/versions.ts
 */
export function reloadOnConflict(queryClient: QueryClient, error: unknown, ...keys: QueryKey[]): Promise<unknown> {
  if (!isApiError(error) || error.status !== 409 || error.code !== "conflict") return Promise.resolve();
  return Promise.all(keys.map((queryKey) => queryClient.invalidateQueries({ queryKey })));
}

type Options = {
  /** Called when a query finds the session gone (expired, or signed out in another tab). */
  onUnauthorized?: () => void;
};

export function createQueryClient({ onUnauthorized }: Options = {}): QueryClient {
  return new QueryClient({
    queryCache: new QueryCache({
      onError: (error, query) => {
        if (isApiError(error) && error.status === 401 && !query.meta?.expectsUnauthorized) onUnauthorized?.();
      },
    }),
    defaultOptions: {
      queries: {
        staleTime: 30_000,
        retry: shouldRetry,
        refetchOnWindowFocus: false,
      },
      mutations: { retry: false },
    },
  });
}
