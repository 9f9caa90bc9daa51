import { queryOptions, useQuery } from "@tanstack/react-query";
import { OutboxSchema } from "@shared/schemas/reports";
import { api } from "@frontend/lib/api-client";
import { reportKeys } from "./keys";

export function getOutbox(signal?: AbortSignal) {
  return api.get("/api/outbox", OutboxSchema, signal);
}

export const outboxQueryOptions = () =>
  queryOptions({
    queryKey: reportKeys.outbox(),
    queryFn: ({ signal }) => getOutbox(signal),
  });

/** What the local mail catcher received; asked again every few seconds, as mail arrives on its own. */
export function useOutbox() {
  return useQuery({ ...outboxQueryOptions(), refetchInterval: 5000 });
}
