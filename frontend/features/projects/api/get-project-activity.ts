import { queryOptions, useQuery } from "@tanstack/react-query";
import type * as z from "zod";
import { ActivityListSchema, type ActivitySchema } from "@shared/schemas/api";
import { api } from "@frontend/lib/api-client";
import { projectKeys } from "./keys";

export type Activity = z.infer<typeof ActivitySchema>;

export async function getProjectActivity(id: string, signal?: AbortSignal): Promise<Activity[]> {
  const { activity } = await api.get(`/api/projects/${encodeURIComponent(id)}/activity`, ActivityListSchema, signal);
  return activity;
}

export const projectActivityQueryOptions = (id: string) =>
  queryOptions({
    queryKey: projectKeys.activity(id),
    queryFn: ({ signal }) => getProjectActivity(id, signal),
  });

export function useProjectActivity(id: string) {
  return useQuery(projectActivityQueryOptions(id));
}
