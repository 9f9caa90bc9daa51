import { QueryCache, QueryClient } from "@tanstack/react-query";
import { isApiError } from "./api-client";

/** A client error (4xx) will not get better by asking again; network and 5xx may. */
function shouldRetry(failureCount: number, error: unknown): boolean {
  if (isApiError(error) && error.status >= 400 && error.status < 500) return false;
  return failureCount < 2;
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
