import type { ReportSummary } from "@shared/schemas/reports";
import { Badge } from "@frontend/components/ui/badge";

/** Draft or released, and acknowledged once the supplier has; superseded when a newer revision exists. */
export function ReportStatus({
  report,
  showLatest = true,
}: {
  report: Pick<ReportSummary, "status" | "acknowledgedAt" | "isLatest">;
  showLatest?: boolean;
}) {
  return (
    <span className="inline-flex flex-wrap items-center gap-1">
      {report.status === "draft" ? (
        <Badge tone="neutral" dot>
          Draft
        </Badge>
      ) : (
        <Badge tone="pass" dot>
          Released
        </Badge>
      )}
      {report.acknowledgedAt ? <Badge tone="accel">Acknowledged</Badge> : null}
      {showLatest && !report.isLatest ? <Badge tone="asic">Superseded</Badge> : null}
    </span>
  );
}

export const reportTitle = (r: Pick<ReportSummary, "code" | "revision">) => `${r.code} revision ${r.revision}`;
