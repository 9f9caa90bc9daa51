import type { QueryClient } from "@tanstack/react-query";
import type { Report } from "@shared/schemas/reports";
import { projectKeys } from "@frontend/features/projects";
import { reportKeys } from "./keys";

/** After any change to a report: its page, every list, the build options and the project's activity. */
export function refreshAfter(queryClient: QueryClient, report: Pick<Report, "id" | "projectId">) {
  return Promise.all([
    queryClient.invalidateQueries({ queryKey: reportKeys.lists() }),
    queryClient.invalidateQueries({ queryKey: reportKeys.details() }),
    queryClient.invalidateQueries({ queryKey: reportKeys.options(report.projectId) }),
    queryClient.invalidateQueries({ queryKey: projectKeys.activity(report.projectId) }),
  ]);
}
