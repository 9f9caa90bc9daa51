import type { Role } from "@shared/schemas/common";

// Mirrors the role table of DESIGN.md for what the client shows. The server checks
// every route on its own; hiding a button here is a courtesy, not a check.
const RULES = {
  "projects.read": ["admin", "engineer", "reviewer"],
  "projects.write": ["admin", "engineer"],
  "revisions.write": ["admin", "engineer"],
  "revisions.review": ["admin", "reviewer"],
  "suppliers.read": ["admin", "engineer", "reviewer"],
  "suppliers.write": ["admin"],
  "members.manage": ["admin"],
  "reports.inbox": ["supplier"],
  "reports.read": ["admin", "engineer", "reviewer", "supplier"],
  "reports.write": ["admin", "engineer"],
  "reports.release": ["admin", "reviewer"],
  "reports.send": ["admin", "engineer", "reviewer"],
  "reports.acknowledge": ["supplier"],
  "outbox.read": ["admin"],
  "studies.run": ["admin", "engineer"],
} as const satisfies Record<string, readonly Role[]>;

export type Permission = keyof typeof RULES;

export function can(role: Role, permission: Permission): boolean {
  return (RULES[permission] as readonly Role[]).includes(role);
}

export const ROLE_LABELS: Record<Role, string> = {
  admin: "Admin",
  engineer: "Engineer",
  reviewer: "Reviewer",
  supplier: "Supplier",
};

export const ROLE_DESCRIPTIONS: Record<Role, string> = {
  admin: "Everything, plus members, invitations and suppliers",
  engineer: "Creates and edits projects, stacks, studies and reports",
  reviewer: "Reads everything, comments, approves or sends back",
  supplier: "Only reports released to their own company",
};

/** Where each role lands after signing in. */
export function homePath(role: Role): string {
  return role === "supplier" ? "/reports" : "/projects";
}
