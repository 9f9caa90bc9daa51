import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "@frontend/lib/api-client";
import { supplierKeys } from "./keys";

export function deleteSupplier(id: string): Promise<void> {
  return api.delete(`/api/suppliers/${encodeURIComponent(id)}`);
}

export function useDeleteSupplier() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deleteSupplier,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: supplierKeys.all }),
  });
}
