import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { MeSchema, type Me } from "@shared/schemas/api";
import { api } from "@frontend/lib/api-client";
import { authKeys } from "./keys";

export function getMe(signal?: AbortSignal): Promise<Me> {
  return api.get("/api/me", MeSchema, signal);
}

export const meQueryOptions = () =>
  queryOptions({
    queryKey: authKeys.me(),
    queryFn: ({ signal }) => getMe(signal),
    staleTime: 5 * 60_000,
    // Signed out is an expected answer here: the route guards turn it into the sign-in page.
    meta: { expectsUnauthorized: true },
  });

/** The signed-in member. Only used under the app layout, whose loader has fetched it. */
export function useMe(): Me {
  return useSuspenseQuery(meQueryOptions()).data;
}
