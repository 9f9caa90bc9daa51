import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "@frontend/lib/api-client";
import { reloadOnConflict } from "@frontend/lib/query-client";
import { supplierKeys } from "./keys";

/** On the version last read: a supplier someone else changed meanwhile is a 409, and is kept. */
export function deleteSupplier({ id, version }: { id: string; version: number }): Promise<void> {
  return api.delete(`/api/suppliers/${encodeURIComponent(id)}`, version);
}

export function useDeleteSupplier() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deleteSupplier,
    onError: (error) => reloadOnConflict(queryClient, error, supplierKeys.all),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: supplierKeys.all }),
  });
}
