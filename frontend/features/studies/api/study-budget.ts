import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { StudyBudgetSchema, type StudyBudget } from "@shared/schemas/studies";
import { api } from "@frontend/lib/api-client";
import { studyKeys } from "./keys";

/** The workspace's work budget of one study and the pace measured on its finished studies. */
export function getStudyBudget(signal?: AbortSignal): Promise<StudyBudget> {
  return api.get("/api/workspace/study-budget", StudyBudgetSchema, signal);
}

export function useStudyBudget() {
  return useQuery({ queryKey: studyKeys.budget(), queryFn: ({ signal }) => getStudyBudget(signal), staleTime: 60_000 });
}

/** Admins only: the server refuses anyone else. */
export function useSetStudyBudget() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (budget: number) => api.patch("/api/workspace/study-budget", { budget }, StudyBudgetSchema),
    onSuccess: (b) => queryClient.setQueryData(studyKeys.budget(), b),
  });
}
