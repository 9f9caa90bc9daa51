import { useMutation, useQueryClient } from "@tanstack/react-query";
import type * as z from "zod";
import { SupplierSchema, type Supplier, type UpdateSupplierSchema } from "@shared/schemas/api";
import { api } from "@frontend/lib/api-client";
import { supplierKeys } from "./keys";

export type UpdateSupplier = z.infer<typeof UpdateSupplierSchema>;

export function updateSupplier({ id, version, changes }: { id: string; version: number; changes: UpdateSupplier }): Promise<Supplier> {
  return api.patch(`/api/suppliers/${encodeURIComponent(id)}`, changes, SupplierSchema, version);
}

export function useUpdateSupplier() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateSupplier,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: supplierKeys.all }),
  });
}
