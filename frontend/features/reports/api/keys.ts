export const reportKeys = {
  all: ["reports"] as const,
  lists: () => [...reportKeys.all, "list"] as const,
  list: (filters: { projectId?: string; status?: string }) => [...reportKeys.lists(), filters] as const,
  details: () => [...reportKeys.all, "detail"] as const,
  detail: (id: string) => [...reportKeys.details(), id] as const,
  options: (projectId: string) => [...reportKeys.all, "options", projectId] as const,
  outbox: () => ["outbox"] as const,
};
