import type { ReactNode } from "react";
import { Link } from "react-router";
import type { Report } from "@shared/schemas/reports";
import { ChevronLeftIcon } from "@frontend/components/ui/icons";
import { ReportStatus, reportTitle } from "./report-status";

/** The way back, the report's code and state, where it comes from, and the actions. */
export function ReportHeader({ report, asSupplier, actions }: { report: Report; asSupplier: boolean; actions: ReactNode[] }) {
  const c = report.content;
  return (
    <>
      <Link
        to={asSupplier ? "/reports" : `/projects/${report.projectId}`}
        className="mb-3 inline-flex items-center gap-1 text-xs font-semibold text-ink/55 hover:text-ink"
      >
        <ChevronLeftIcon size={14} /> {asSupplier ? "Reports" : report.projectName}
      </Link>

      <div className="mb-4 flex flex-wrap items-start justify-between gap-4">
        <div className="min-w-0">
          <p className="text-xs font-bold tracking-[0.06em] text-mag uppercase">Supplier tolerance report</p>
          <div className="mt-0.5 flex flex-wrap items-center gap-2.5">
            <h1 className="text-[22px] leading-7 font-extrabold tracking-[-0.015em] text-ink">{reportTitle(report)}</h1>
            <ReportStatus report={report} />
          </div>
          <p className="mt-1 text-[13px] text-ink/65">
            <span className="font-semibold text-ink">{report.supplierName}</span> · {report.projectName} · from study {c.study.number}
            {c.study.label ? ` (${c.study.label})` : ""} on stack revision {c.revision.number}
          </p>
        </div>
        <div className="flex flex-wrap items-center gap-2">{actions}</div>
      </div>
    </>
  );
}
