import { RoleSchema, type Role } from "./schemas/common";

/**
 * Who may do what (DESIGN.md, "People and roles"): the one table of rights. The server's
 * `allow(right)` (backend/middleware/session.ts) checks every route against it; the client's
 * guards and buttons (frontend/lib/permissions.ts) read the same table, so a screen never
 * offers what the server would refuse. Finer rules that depend on the record (a supplier sees
 * only its own company's released reports) stay in the services.
 */
export const RIGHTS = [
  /** projects and everything under them: revisions, studies, data sets, report options */
  "projects.read",
  "projects.write",
  "revisions.write",
  "revisions.comment",
  "revisions.review",
  "studies.run",
  /** sweeps and tolerance allocations on a revision (issue 12) */
  "whatif.run",
  "datasets.write",
  /** measurements sent against a released report (staff who write, and its supplier) */
  "datasets.send",
  "suppliers.read",
  "suppliers.write",
  "members.manage",
  /** workspace-wide settings, such as the work budget of one study */
  "workspace.settings",
  "outbox.read",
  /** staff: the workspace's reports; a supplier: its company's released ones (service check) */
  "reports.read",
  "reports.comment",
  /** the supplier's own list of reports released to it */
  "reports.inbox",
  "reports.write",
  "reports.release",
  "reports.send",
  "reports.acknowledge",
  /** one's own notifications and their e-mail settings */
  "notifications.read",
  /** staff: what waits for review or for one's own action, and the per-project counts (the home page) */
  "reviews.read",
  /** the server's status page: where studies run, the job queue and its workers */
  "status.read",
] as const;
export type Right = (typeof RIGHTS)[number];

const STAFF_READ = [
  "notifications.read",
  "reviews.read",
  "projects.read",
  "revisions.comment",
  "suppliers.read",
  "reports.read",
  "reports.comment",
  "reports.send",
] as const;

/** The table: each role and the rights it holds. */
export const ROLE_RIGHTS: Record<Role, readonly Right[]> = {
  admin: [
    ...STAFF_READ,
    "projects.write",
    "revisions.write",
    "revisions.review",
    "studies.run",
    "whatif.run",
    "datasets.write",
    "datasets.send",
    "suppliers.write",
    "members.manage",
    "workspace.settings",
    "outbox.read",
    "reports.write",
    "reports.release",
    "status.read",
  ],
  engineer: [
    ...STAFF_READ,
    "projects.write",
    "revisions.write",
    "studies.run",
    "whatif.run",
    "datasets.write",
    "datasets.send",
    "reports.write",
  ],
  reviewer: [...STAFF_READ, "revisions.review", "reports.release"],
  supplier: ["notifications.read", "reports.read", "reports.comment", "reports.inbox", "reports.acknowledge", "datasets.send"],
};

export function can(role: Role, right: Right): boolean {
  return ROLE_RIGHTS[role].includes(right);
}

/** The roles that hold a right (the server's route check and the role test read this). */
export function rolesWith(right: Right): Role[] {
  return RoleSchema.options.filter((role) => can(role, right));
}

export const ROLE_LABELS: Record<Role, string> = {
  admin: "Admin",
  engineer: "Engineer",
  reviewer: "Reviewer",
  supplier: "Supplier",
};

/** The role inside a sentence ("… invites you to join … as an engineer"). */
export const ROLE_IN_SENTENCE: Record<Role, string> = {
  admin: "an admin",
  engineer: "an engineer",
  reviewer: "a reviewer",
  supplier: "a supplier contact",
};

export const ROLE_DESCRIPTIONS: Record<Role, string> = {
  admin: "Everything, plus members, invitations and suppliers",
  engineer: "Creates and edits projects, stacks, studies and reports",
  reviewer: "Reads everything, comments, approves or sends back",
  supplier: "Only reports released to their own company",
};

/** Where each role lands after signing in: staff on what waits for them (the home page), a supplier on its reports. */
export function homePath(role: Role): string {
  return can(role, "reviews.read") ? "/" : can(role, "projects.read") ? "/projects" : "/reports";
}
