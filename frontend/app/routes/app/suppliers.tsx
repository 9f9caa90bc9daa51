import { useState } from "react";
import type { QueryClient } from "@tanstack/react-query";
import type { LoaderFunctionArgs } from "react-router";
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { EmptyState } from "@frontend/components/ui/empty-state";
import { PlusIcon, SuppliersIcon } from "@frontend/components/ui/icons";
import { PageHeader } from "@frontend/components/ui/page-header";
import { useMe } from "@frontend/features/auth/api/get-me";
import { suppliersQueryOptions, useSuppliers } from "@frontend/features/suppliers/api/get-suppliers";
import { SupplierCard } from "@frontend/features/suppliers/components/supplier-card";
import { SupplierFormDialog } from "@frontend/features/suppliers/components/supplier-form-dialog";
import { can } from "@frontend/lib/permissions";
import { requirePermission } from "../../route-guards";

export const suppliersLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await Promise.all([requirePermission(queryClient, request, "suppliers.read"), queryClient.ensureQueryData(suppliersQueryOptions())]);
    return null;
  };

export function SuppliersRoute() {
  const me = useMe();
  const canManage = can(me.role, "suppliers.write");
  const suppliers = useSuppliers();
  const [adding, setAdding] = useState(false);

  return (
    <>
      <PageHeader
        title="Suppliers"
        description={
          canManage
            ? "The companies that hold your tolerances: assembly houses, substrate makers, die suppliers and board assemblers, and who receives their reports."
            : "The companies that hold your tolerances and who receives their reports. Only an admin can change this list."
        }
        actions={
          canManage ? (
            <Button variant="primary" icon={<PlusIcon />} onClick={() => setAdding(true)}>
              Add company
            </Button>
          ) : null
        }
      />
      {suppliers.isError ? (
        <Alert title="Suppliers could not be loaded">{suppliers.error.message}</Alert>
      ) : suppliers.data && suppliers.data.length === 0 ? (
        <div className="rounded-lg border border-dashed border-line bg-panel">
          <EmptyState icon={<SuppliersIcon />} title="No supplier companies yet">
            {canManage ? "Add the companies that build your package." : "An admin adds the companies that build your packages."}
          </EmptyState>
        </div>
      ) : (
        <div className="grid gap-4 md:grid-cols-2 xl:grid-cols-3">
          {(suppliers.data ?? []).map((supplier) => (
            <SupplierCard key={supplier.id} supplier={supplier} canManage={canManage} />
          ))}
        </div>
      )}
      {adding ? <SupplierFormDialog onClose={() => setAdding(false)} /> : null}
    </>
  );
}
