import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "@frontend/lib/api-client";
import { reloadOnConflict } from "@frontend/lib/query-client";
import { supplierKeys } from "./keys";

/** A contact is part of its supplier's record: removed on the supplier's version last read (`version`). */
export function deleteContact({
  supplierId,
  contactId,
  version,
}: {
  supplierId: string;
  contactId: string;
  version: number;
}): Promise<void> {
  return api.delete(`/api/suppliers/${encodeURIComponent(supplierId)}/contacts/${encodeURIComponent(contactId)}`, version);
}

export function useDeleteContact() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deleteContact,
    onError: (error) => reloadOnConflict(queryClient, error, supplierKeys.all),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: supplierKeys.all }),
  });
}
