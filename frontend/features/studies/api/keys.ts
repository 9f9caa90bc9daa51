export const studyKeys = {
  all: ["studies"] as const,
  lists: () => [...studyKeys.all, "list"] as const,
  list: (projectId: string) => [...studyKeys.lists(), projectId] as const,
  details: () => [...studyKeys.all, "detail"] as const,
  detail: (id: string) => [...studyKeys.details(), id] as const,
  // The revisions as the study screens read them (number, status, requirements, stack).
  revisions: (projectId: string) => [...studyKeys.all, "revisions", projectId] as const,
  revision: (id: string) => [...studyKeys.all, "revision", id] as const,
  field: (site: Record<string, unknown>) => [...studyKeys.all, "geomagnetic-field", site] as const,
  budget: () => [...studyKeys.all, "work-budget"] as const,
};
