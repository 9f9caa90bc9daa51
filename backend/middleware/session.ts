import type { NextFunction, Request, RequestHandler, Response } from "express";
import { fromNodeHeaders } from "better-auth/node";
import { eq } from "drizzle-orm";
import type { Role } from "@shared/schemas/common";
import type { Auth } from "../auth";
import type { Database } from "../db/client";
import { members, workspaces } from "../db/schema";
import { forbidden, unauthorized } from "../lib/errors";

export type Actor = {
  userId: string;
  name: string;
  email: string;
  memberId: string;
  role: Role;
  workspaceId: string;
  workspaceName: string;
  supplierId: string | null;
};

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      actor?: Actor;
    }
  }
}

/** Resolves the session cookie to a workspace member; 401 without one. */
export function requireSession(auth: Auth, db: Database): RequestHandler {
  return async (req: Request, _res: Response, next: NextFunction) => {
    const session = await auth.api.getSession({ headers: fromNodeHeaders(req.headers) });
    if (!session) throw unauthorized();
    const [row] = await db
      .select({ member: members, workspaceName: workspaces.name })
      .from(members)
      .innerJoin(workspaces, eq(workspaces.id, members.workspaceId))
      .where(eq(members.userId, session.user.id))
      .limit(1);
    // A valid account that belongs to no workspace (removed member) may not do anything.
    if (!row) throw forbidden("Your account is not a member of any workspace.");
    req.actor = {
      userId: session.user.id,
      name: session.user.name,
      email: session.user.email,
      memberId: row.member.id,
      role: row.member.role,
      workspaceId: row.member.workspaceId,
      workspaceName: row.workspaceName,
      supplierId: row.member.supplierId,
    };
    next();
  };
}

/** Lets the request through only for the listed roles (checked after requireSession). */
export function allow(...roles: Role[]): RequestHandler {
  return (req, _res, next) => {
    const actor = req.actor;
    if (!actor) throw unauthorized();
    if (!roles.includes(actor.role)) throw forbidden();
    next();
  };
}

export function actorOf(req: Request): Actor {
  if (!req.actor) throw unauthorized();
  return req.actor;
}

/** Who may do what (DESIGN.md, "People and roles"): one place, used by every route. */
export const can = {
  readWorkspace: ["admin", "engineer", "reviewer"] as Role[],
  write: ["admin", "engineer"] as Role[],
  review: ["admin", "reviewer"] as Role[],
  administer: ["admin"] as Role[],
  /** reports: staff see the workspace's, a supplier only its company's released ones (checked in the service) */
  readReports: ["admin", "engineer", "reviewer", "supplier"] as Role[],
  supplier: ["supplier"] as Role[],
};
