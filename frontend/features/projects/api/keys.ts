/** Which projects a list shows: the open ones (default), only the archived ones, or all. */
export type ProjectShown = "open" | "only" | "all";

export const projectKeys = {
  all: ["projects"] as const,
  lists: () => [...projectKeys.all, "list"] as const,
  list: (q: string, archived: ProjectShown = "open") => [...projectKeys.lists(), { q, archived }] as const,
  details: () => [...projectKeys.all, "detail"] as const,
  detail: (id: string) => [...projectKeys.details(), id] as const,
  activity: (id: string) => [...projectKeys.detail(id), "activity"] as const,
};
