import type { RevisionStatus } from "@shared/schemas/revisions";
import { Badge, type BadgeTone } from "@frontend/components/ui/badge";

export const STATUS_LABEL: Record<RevisionStatus, string> = { draft: "Draft", in_review: "In review", approved: "Approved" };
const TONE: Record<RevisionStatus, BadgeTone> = { draft: "neutral", in_review: "gyro", approved: "pass" };

export function RevisionStatusChip({ status, className }: { status: RevisionStatus; className?: string }) {
  return (
    <Badge tone={TONE[status]} dot className={className}>
      {STATUS_LABEL[status]}
    </Badge>
  );
}
