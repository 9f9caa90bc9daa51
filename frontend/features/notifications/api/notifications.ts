import { queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { NotificationListSchema } from "@shared/schemas/notifications";
import { api } from "@frontend/lib/api-client";

const key = ["notifications"] as const;

/** One's notifications; polled so a waiting review shows up without a reload. */
export const notificationsQueryOptions = () =>
  queryOptions({
    queryKey: key,
    queryFn: ({ signal }) => api.get("/api/notifications", NotificationListSchema, signal),
    refetchInterval: 20_000,
  });

export function useNotifications() {
  return useQuery(notificationsQueryOptions());
}

/** Marks the given notifications read, or all of them without ids. */
export function useMarkRead() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (ids?: string[]) => api.post("/api/notifications/read", ids ? { ids } : {}, NotificationListSchema),
    onSuccess: (list) => queryClient.setQueryData(key, list),
  });
}
