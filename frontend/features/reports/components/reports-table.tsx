import { Link } from "react-router";
import type { ReportSummary } from "@shared/schemas/reports";
import { Table, TableFrame, Td, Th, THead, Tr } from "@frontend/components/ui/table";
import { formatDate, formatDateTime, formatRelative } from "@frontend/lib/format";
import { ReportStatus, reportTitle } from "./report-status";
import { formatIndex } from "@shared/format";

/** Every report the reader may see; the supplier's view leaves out what is internal (drafts, who built it). */
export function ReportsTable({
  reports,
  supplierView,
  showProject = true,
}: {
  reports: ReportSummary[];
  supplierView: boolean;
  showProject?: boolean;
}) {
  return (
    <TableFrame>
      <Table aria-label="Reports">
        <THead>
          <tr>
            <Th>Report</Th>
            {supplierView ? null : <Th>Supplier</Th>}
            {showProject ? <Th>Project</Th> : null}
            <Th align="right">Tolerances</Th>
            <Th align="right">Cpk asked</Th>
            <Th>Status</Th>
            <Th align="right">{supplierView ? "Released" : "Updated"}</Th>
            <Th align="right">Acknowledged</Th>
          </tr>
        </THead>
        <tbody>
          {reports.map((r) => {
            const when = supplierView ? r.releasedAt : (r.releasedAt ?? r.createdAt);
            return (
              <Tr key={r.id}>
                <Td className="py-2 whitespace-nowrap">
                  <Link to={`/reports/${r.id}`} className="font-bold text-ink decoration-ink/30 underline-offset-2 hover:underline">
                    {reportTitle(r)}
                  </Link>
                  <p className="text-xs text-ink/55">
                    Study {r.studyNumber} on stack revision {r.stackRevisionNumber}
                  </p>
                </Td>
                {supplierView ? null : <Td className="font-semibold text-ink/85">{r.supplierName}</Td>}
                {showProject ? (
                  <Td className="max-w-[280px]">
                    <span className="text-ink/80">{r.projectName}</span>
                  </Td>
                ) : null}
                <Td numeric>{r.toleranceCount}</Td>
                <Td numeric>{formatIndex(r.cpk)}</Td>
                <Td>
                  <ReportStatus report={r} />
                </Td>
                <Td numeric className="text-ink/70">
                  {when ? (
                    <time dateTime={when} title={formatDateTime(when)}>
                      {formatRelative(when)}
                    </time>
                  ) : (
                    "—"
                  )}
                </Td>
                <Td numeric className="text-ink/70">
                  {r.acknowledgedAt ? (
                    <time
                      dateTime={r.acknowledgedAt}
                      title={`${formatDateTime(r.acknowledgedAt)}${r.acknowledgedByName ? ` by ${r.acknowledgedByName}` : ""}`}
                    >
                      {formatDate(r.acknowledgedAt)}
                    </time>
                  ) : (
                    <span className="text-ink/40">not yet</span>
                  )}
                </Td>
              </Tr>
            );
          })}
        </tbody>
      </Table>
    </TableFrame>
  );
}
