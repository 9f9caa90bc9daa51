export const revisionKeys = {
  all: ["revisions"] as const,
  lists: () => [...revisionKeys.all, "list"] as const,
  list: (projectId: string) => [...revisionKeys.lists(), projectId] as const,
  details: () => [...revisionKeys.all, "detail"] as const,
  detail: (id: string) => [...revisionKeys.details(), id] as const,
};
