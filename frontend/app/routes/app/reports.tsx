import type { QueryClient } from "@tanstack/react-query";
import type { LoaderFunctionArgs } from "react-router";
import { EmptyState } from "@frontend/components/ui/empty-state";
import { ReportsIcon } from "@frontend/components/ui/icons";
import { PageHeader } from "@frontend/components/ui/page-header";
import { useMe } from "@frontend/features/auth/api/get-me";
import { requirePermission } from "../../route-guards";

export const reportsLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, "reports.inbox");
    return null;
  };

/** The supplier's whole view of the workspace: reports released to their company. */
export function ReportsRoute() {
  const me = useMe();
  return (
    <>
      <PageHeader
        title="Reports"
        description={`Tolerance reports that ${me.workspace.name} has released to your company.`}
      />
      <div className="rounded-lg border border-line bg-panel">
        <EmptyState icon={<ReportsIcon />} title="No reports released to you yet" className="py-14">
          When a report is released, it appears here: the tolerances your process must hold, with the capability asked for,
          to read, download and acknowledge. Where a report asks for first-build measurements, you upload them here too.
        </EmptyState>
      </div>
    </>
  );
}
