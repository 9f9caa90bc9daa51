import { queryOptions, useQuery } from "@tanstack/react-query";
import { ReviewQueueSchema } from "@shared/schemas/review-queue";
import { api } from "@frontend/lib/api-client";

export const reviewQueueKey = ["review-queue"] as const;

/** What waits for the signed-in member of staff; polled like the notifications, so the counts follow others' acts. */
export const reviewQueueQueryOptions = () =>
  queryOptions({
    queryKey: reviewQueueKey,
    queryFn: ({ signal }) => api.get("/api/review-queue", ReviewQueueSchema, signal),
    refetchInterval: 20_000,
    // asked again on each page that shows it, so an approval just made elsewhere is not counted still
    staleTime: 0,
  });

/** `enabled` off for a role without the right (a supplier): no request, no data. */
export function useReviewQueue(enabled = true) {
  return useQuery({ ...reviewQueueQueryOptions(), enabled });
}
