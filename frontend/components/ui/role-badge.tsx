import type { Role } from "@shared/schemas/common";
import { ROLE_LABELS } from "@frontend/lib/permissions";
import { Badge, type BadgeTone } from "./badge";

const ROLE_TONES: Record<Role, BadgeTone> = {
  admin: "board",
  engineer: "gyro",
  reviewer: "substrate",
  supplier: "mag",
};

export function RoleBadge({ role, className }: { role: Role; className?: string }) {
  return (
    <Badge tone={ROLE_TONES[role]} className={className}>
      {ROLE_LABELS[role]}
    </Badge>
  );
}
