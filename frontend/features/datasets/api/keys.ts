export const datasetKeys = {
  all: ["datasets"] as const,
  lists: () => [...datasetKeys.all, "list"] as const,
  list: (projectId: string) => [...datasetKeys.lists(), projectId] as const,
  details: () => [...datasetKeys.all, "detail"] as const,
  detail: (id: string) => [...datasetKeys.details(), id] as const,
  statistics: (id: string, column: string) => [...datasetKeys.detail(id), "statistics", column] as const,
  /** what was sent through one report (a supplier sees only these) */
  report: (reportId: string) => [...datasetKeys.all, "report", reportId] as const,
};
