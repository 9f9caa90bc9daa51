import { useQuery } from "@tanstack/react-query";
import { StackTemplatesResponseSchema, type StackTemplateEntry } from "@shared/schemas/stack-help";
import { api } from "@frontend/lib/api-client";

export async function getStackTemplates(signal?: AbortSignal): Promise<StackTemplateEntry[]> {
  const { templates } = await api.get("/api/stack-templates", StackTemplatesResponseSchema, signal);
  return templates;
}

/** The stack templates; fixed data of the server, fetched when the dialog first opens. */
export function useStackTemplates(enabled: boolean) {
  return useQuery({ queryKey: ["stack-templates"], queryFn: ({ signal }) => getStackTemplates(signal), enabled, staleTime: Infinity });
}
