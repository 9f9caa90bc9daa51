import { queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { NotificationSettingsSchema, type NotificationKind } from "@shared/schemas/notifications";
import { api } from "@frontend/lib/api-client";

const key = ["notification-settings"] as const;

export const notificationSettingsQueryOptions = () =>
  queryOptions({
    queryKey: key,
    queryFn: ({ signal }) => api.get("/api/notification-settings", NotificationSettingsSchema, signal),
  });

export function useNotificationSettings() {
  return useQuery(notificationSettingsQueryOptions());
}

/** Turns the e-mail of one kind on or off; the answer is the whole settings list as stored. */
export function useSetNotificationMail() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ kind, email }: { kind: NotificationKind; email: boolean }) =>
      api.put("/api/notification-settings", { email: { [kind]: email } }, NotificationSettingsSchema),
    onSuccess: (settings) => queryClient.setQueryData(key, settings),
  });
}
