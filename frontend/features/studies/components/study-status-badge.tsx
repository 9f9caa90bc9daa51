import type { StudyStatus } from "@shared/schemas/studies";
import { Badge, type BadgeTone } from "@frontend/components/ui/badge";

const LABELS: Record<StudyStatus, string> = {
  queued: "Queued",
  running: "Running",
  finished: "Finished",
  // A run that stopped with an error says nothing about the package: never a red "Fail".
  failed: "Run failed",
  cancelled: "Cancelled",
  interrupted: "Interrupted",
};
const TONES: Record<StudyStatus, BadgeTone> = {
  queued: "neutral",
  running: "gyro",
  finished: "neutral",
  failed: "neutral",
  cancelled: "neutral",
  interrupted: "neutral",
};

export function studyStatusLabel(status: StudyStatus) {
  return LABELS[status];
}

export function StudyStatusBadge({ status }: { status: StudyStatus }) {
  return (
    <Badge tone={TONES[status]} dot={status === "running"}>
      {LABELS[status]}
    </Badge>
  );
}

/** The verdict of a finished study: every requirement met or not; nothing for a study without one. */
export function VerdictBadge({ passes }: { passes: boolean | null }) {
  if (passes === null) return null;
  return (
    <Badge tone={passes ? "pass" : "fail"} dot>
      {passes ? "Pass" : "Fail"}
    </Badge>
  );
}
