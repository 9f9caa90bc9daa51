/**
 * The rights table (shared/permissions.ts) against the roles of DESIGN.md, "People and roles".
 * The route-by-route behaviour is checked in roles.test.ts; this file checks the table itself
 * and that the server's allow() reads it.
 */
import { describe, expect, it } from "vitest";
import type { NextFunction, Request, Response } from "express";
import { can, RIGHTS, ROLE_RIGHTS, rolesWith, type Right } from "@shared/permissions";
import { RoleSchema, type Role } from "@shared/schemas/common";
import { allow } from "@backend/middleware/session";
import { HttpError } from "@backend/lib/errors";

const STAFF: Role[] = ["admin", "engineer", "reviewer"];

describe("rights table", () => {
  it("has one row for every role of the schema and only known rights in it", () => {
    expect(Object.keys(ROLE_RIGHTS).sort()).toEqual([...RoleSchema.options].sort());
    for (const rights of Object.values(ROLE_RIGHTS)) {
      for (const right of rights) expect(RIGHTS).toContain(right);
      expect(new Set(rights).size).toBe(rights.length);
    }
  });

  it("gives every right to someone, and the admin every staff right", () => {
    for (const right of RIGHTS) expect(rolesWith(right).length).toBeGreaterThan(0);
    const staffRights = RIGHTS.filter((r) => can("engineer", r) || can("reviewer", r));
    for (const right of staffRights) expect(can("admin", right)).toBe(true);
  });

  it.each<[Right, Role[]]>([
    // DESIGN.md: engineers create and edit; reviewers read, comment, approve or send back.
    ["projects.read", STAFF],
    ["projects.write", ["admin", "engineer"]],
    ["revisions.write", ["admin", "engineer"]],
    ["revisions.review", ["admin", "reviewer"]],
    ["studies.run", ["admin", "engineer"]],
    ["whatif.run", ["admin", "engineer"]],
    ["reports.release", ["admin", "reviewer"]],
    ["reports.acknowledge", ["supplier"]],
    ["members.manage", ["admin"]],
    ["workspace.settings", ["admin"]],
    ["suppliers.write", ["admin"]],
    ["outbox.read", ["admin"]],
    ["reports.read", ["admin", "engineer", "reviewer", "supplier"]],
    ["datasets.send", ["admin", "engineer", "supplier"]],
  ])("%s belongs to %j", (right, roles) => {
    expect(rolesWith(right)).toEqual(roles);
  });

  it("keeps a supplier out of everything of the workspace but reports", () => {
    const supplierRights = ROLE_RIGHTS.supplier;
    expect(supplierRights.every((r) => r.startsWith("reports.") || r === "datasets.send" || r === "notifications.read")).toBe(true);
  });
});

describe("allow()", () => {
  function run(right: Right, role: Role | null): unknown {
    const req = { actor: role ? { role } : undefined } as Partial<Request> as Request;
    let passed = false;
    const next: NextFunction = () => {
      passed = true;
    };
    try {
      allow(right)(req, {} as Response, next);
    } catch (error) {
      return error instanceof HttpError ? error.status : error;
    }
    return passed ? "next" : "stopped";
  }

  it("lets exactly the roles of the table through", () => {
    for (const right of RIGHTS) {
      for (const role of RoleSchema.options) expect(run(right, role)).toBe(can(role, right) ? "next" : 403);
    }
    expect(run("projects.read", null)).toBe(401);
  });
});
