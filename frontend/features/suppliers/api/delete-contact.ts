import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "@frontend/lib/api-client";
import { supplierKeys } from "./keys";

export function deleteContact({ supplierId, contactId }: { supplierId: string; contactId: string }): Promise<void> {
  return api.delete(`/api/suppliers/${encodeURIComponent(supplierId)}/contacts/${encodeURIComponent(contactId)}`);
}

export function useDeleteContact() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deleteContact,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: supplierKeys.all }),
  });
}
