import type { Project } from "@shared/schemas/api";
import { Badge } from "@frontend/components/ui/badge";

/** The last study's verdict as one chip; a study that has not finished says where it is. */
export function StudyResultChip({ study }: { study: Project["lastStudy"] }) {
  if (!study) return <span className="text-xs text-ink/45">No study yet</span>;
  if (study.passes === true)
    return (
      <Badge tone="pass" dot>
        Pass
      </Badge>
    );
  if (study.passes === false)
    return (
      <Badge tone="fail" dot>
        Fail
      </Badge>
    );
  const label: Record<string, string> = {
    queued: "Queued",
    running: "Running",
    failed: "Study failed",
    cancelled: "Cancelled",
    finished: "Finished",
  };
  return <Badge tone={study.status === "failed" ? "fail" : "neutral"}>{label[study.status] ?? study.status}</Badge>;
}
