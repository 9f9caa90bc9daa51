import { useMutation, useQueryClient } from "@tanstack/react-query";
import type * as z from "zod";
import { SupplierSchema, type CreateSupplierSchema, type Supplier } from "@shared/schemas/api";
import { api } from "@frontend/lib/api-client";
import { supplierKeys } from "./keys";

export type CreateSupplier = z.infer<typeof CreateSupplierSchema>;

export function createSupplier(input: CreateSupplier): Promise<Supplier> {
  return api.post("/api/suppliers", input, SupplierSchema);
}

export function useCreateSupplier() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createSupplier,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: supplierKeys.all }),
  });
}
