import { useState } from "react";
import { Link, useNavigate } from "react-router";
import { Button } from "@frontend/components/ui/button";
import { EmptyState } from "@frontend/components/ui/empty-state";
import { PlusIcon } from "@frontend/components/ui/icons";
import { Panel } from "@frontend/components/ui/panel";
import { Spinner } from "@frontend/components/ui/spinner";
import { cn } from "@frontend/lib/cn";
import { formatDateTime, formatRelative } from "@frontend/lib/format";
import { useReports } from "../api/get-reports";
import { BuildReportDialog } from "./build-report-dialog";
import { ReportStatus, reportTitle } from "./report-status";
import { formatIndex } from "@shared/format";

/** The project's supplier reports on its page, newest first, with "Build report" for engineers. */
export function ReportsPanel({ projectId, canWrite, className }: { projectId: string; canWrite: boolean; className?: string }) {
  const reports = useReports({ projectId });
  const [building, setBuilding] = useState(false);
  const navigate = useNavigate();
  const list = reports.data ?? [];

  return (
    <Panel
      title="Reports"
      meta={list.length ? `${list.length}` : undefined}
      accent="var(--color-mag)"
      padded={false}
      className={cn("md:col-span-2", className)}
      actions={
        canWrite ? (
          <Button size="sm" variant="primary" icon={<PlusIcon size={14} />} onClick={() => setBuilding(true)}>
            Build report
          </Button>
        ) : null
      }
    >
      {reports.isPending ? (
        <p className="flex items-center gap-2 px-4 py-6 text-[13px] text-ink/55">
          <Spinner /> Loading reports…
        </p>
      ) : reports.isError ? (
        <p className="px-4 py-6 text-[13px] text-fail">{reports.error.message}</p>
      ) : list.length === 0 ? (
        <EmptyState title="No report yet" className="py-8">
          One tolerance report per supplier company, built from an approved revision and a finished study, released after review and
          acknowledged by the supplier.
        </EmptyState>
      ) : (
        <ul className="divide-y divide-line/70" aria-label="Project reports">
          {list.map((r) => (
            <li key={r.id} className="flex items-center gap-3 px-4 py-2.5 hover:bg-paper/60">
              <div className="min-w-0 flex-1">
                <Link to={`/reports/${r.id}`} className="text-[13px] font-bold text-ink hover:text-gyro hover:underline">
                  {reportTitle(r)}
                </Link>
                <p className="text-xs text-ink/55">
                  {r.supplierName} · {r.toleranceCount} tolerances · Cpk ≥ {formatIndex(r.cpk)} · study {r.studyNumber}
                </p>
              </div>
              <ReportStatus report={r} />
              <time
                dateTime={r.releasedAt ?? r.createdAt}
                title={formatDateTime(r.releasedAt ?? r.createdAt)}
                className="w-20 shrink-0 text-right text-xs text-ink/50 tabular-nums"
              >
                {formatRelative(r.releasedAt ?? r.createdAt)}
              </time>
            </li>
          ))}
        </ul>
      )}
      {building ? (
        <BuildReportDialog projectId={projectId} open onClose={() => setBuilding(false)} onBuilt={(r) => navigate(`/reports/${r.id}`)} />
      ) : null}
    </Panel>
  );
}
