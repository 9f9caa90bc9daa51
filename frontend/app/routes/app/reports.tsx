import { useState } from "react";
import type { QueryClient } from "@tanstack/react-query";
import type { LoaderFunctionArgs } from "react-router";
import { Alert } from "@frontend/components/ui/alert";
import { EmptyState } from "@frontend/components/ui/empty-state";
import { ReportsIcon } from "@frontend/components/ui/icons";
import { PageHeader } from "@frontend/components/ui/page-header";
import { Spinner } from "@frontend/components/ui/spinner";
import { useMe } from "@frontend/features/auth/api/get-me";
import { reportsQueryOptions, useReports, type ReportFilters } from "@frontend/features/reports/api/get-reports";
import { ReportsTable } from "@frontend/features/reports/components/reports-table";
import { cn } from "@frontend/lib/cn";
import { can } from "@frontend/lib/permissions";
import { requirePermission } from "../../route-guards";

export const reportsLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, "reports.read");
    await queryClient.prefetchQuery(reportsQueryOptions({}));
    return null;
  };

const FILTERS: Array<{ label: string; value: ReportFilters["status"] }> = [
  { label: "All", value: undefined },
  { label: "Drafts", value: "draft" },
  { label: "Released", value: "released" },
];

/** A supplier's whole view of the workspace (the reports released to its company); for staff, every report. */
export function ReportsRoute() {
  const me = useMe();
  const supplierView = can(me.role, "reports.inbox");
  const [status, setStatus] = useState<ReportFilters["status"]>(undefined);
  const reports = useReports(status ? { status } : {});
  const list = reports.data ?? [];

  return (
    <>
      <PageHeader
        title="Reports"
        description={
          supplierView
            ? `Tolerance reports that ${me.workspace.name} has released to your company: what your process must hold, with the capability asked. Open one to download it, ask a question or acknowledge it.`
            : "Supplier tolerance reports of every project: drafts waiting for review, released reports, and whether each supplier has acknowledged its own."
        }
        actions={
          supplierView ? null : (
            <div className="flex rounded-md border border-line bg-panel p-0.5" role="group" aria-label="Show">
              {FILTERS.map((f) => (
                <button
                  key={f.label}
                  type="button"
                  aria-pressed={status === f.value}
                  onClick={() => setStatus(f.value)}
                  className={cn(
                    "h-7 rounded px-3 text-xs font-semibold",
                    status === f.value ? "bg-ink text-paper" : "text-ink/65 hover:text-ink",
                  )}
                >
                  {f.label}
                </button>
              ))}
            </div>
          )
        }
      />
      {reports.isPending ? (
        <p className="flex items-center gap-2 text-[13px] text-ink/55">
          <Spinner /> Loading reports…
        </p>
      ) : reports.isError ? (
        <Alert title="Reports could not be loaded">{reports.error.message}</Alert>
      ) : list.length === 0 ? (
        <div className="rounded-lg border border-line bg-panel">
          {supplierView ? (
            <EmptyState icon={<ReportsIcon />} title="No reports released to you yet" className="py-14">
              When a report is released, it appears here: the tolerances your process must hold, with the capability asked for, to read,
              download and acknowledge.
            </EmptyState>
          ) : (
            <EmptyState icon={<ReportsIcon />} title={status ? `No ${status} reports` : "No reports yet"} className="py-14">
              An engineer builds a supplier's report from a project: a finished study on an approved stack revision, for one of the
              companies that own its tolerances.
            </EmptyState>
          )}
        </div>
      ) : (
        <ReportsTable reports={list} supplierView={supplierView} />
      )}
    </>
  );
}
