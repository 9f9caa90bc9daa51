import { useMutation, useQueryClient } from "@tanstack/react-query";
import type * as z from "zod";
import { SupplierContactSchema, type CreateContactSchema } from "@shared/schemas/api";
import { api } from "@frontend/lib/api-client";
import { supplierKeys } from "./keys";

export type CreateContact = z.infer<typeof CreateContactSchema>;
export type SupplierContact = z.infer<typeof SupplierContactSchema>;

export function createContact({ supplierId, contact }: { supplierId: string; contact: CreateContact }): Promise<SupplierContact> {
  return api.post(`/api/suppliers/${encodeURIComponent(supplierId)}/contacts`, contact, SupplierContactSchema);
}

export function useCreateContact() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createContact,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: supplierKeys.all }),
  });
}
