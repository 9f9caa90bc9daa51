import { queryOptions, useQuery } from "@tanstack/react-query";
import { SupplierListSchema, type Supplier } from "@shared/schemas/api";
import { api } from "@frontend/lib/api-client";
import { supplierKeys } from "./keys";

export async function getSuppliers(signal?: AbortSignal): Promise<Supplier[]> {
  const { suppliers } = await api.get("/api/suppliers", SupplierListSchema, signal);
  return suppliers;
}

export const suppliersQueryOptions = () =>
  queryOptions({
    queryKey: supplierKeys.list(),
    queryFn: ({ signal }) => getSuppliers(signal),
  });

export function useSuppliers() {
  return useQuery(suppliersQueryOptions());
}
