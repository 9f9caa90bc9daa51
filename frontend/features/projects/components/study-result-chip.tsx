import type { Project } from "@shared/schemas/api";
import { Badge } from "@frontend/components/ui/badge";

const STATUS_LABELS: Record<string, string> = {
  queued: "Queued",
  running: "Running",
  // A run that stopped with an error says nothing about the package: keep it apart from a red "Fail".
  failed: "Run failed",
  cancelled: "Cancelled",
  interrupted: "Interrupted",
  finished: "Finished",
};

/** The last study's verdict as one chip; a study without a verdict says where it is. */
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
  return (
    <Badge tone={study.status === "running" ? "gyro" : "neutral"} dot={study.status === "running"}>
      {STATUS_LABELS[study.status] ?? study.status}
    </Badge>
  );
}
