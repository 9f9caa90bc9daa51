import type { NextFunction, Request, RequestHandler, Response } from "express";
import { fromNodeHeaders } from "better-auth/node";
import { eq } from "drizzle-orm";
import { can, type Right } from "@shared/permissions";
import type { Role } from "@shared/schemas/common";
import type { Auth } from "../auth";
import type { Database } from "../db/client";
import { members, workspaces } from "../db/schema";
import { forbidden, unauthorized } from "../lib/errors";
import type { SessionCache } from "./session-cache";

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

/**
 * Resolves the session cookie to a workspace member; 401 without one. With a cache, a cookie
 * resolved a moment ago is answered from it (see SessionCache for why that stays exact).
 */
export function requireSession(auth: Auth, db: Database, cache?: SessionCache): RequestHandler {
  return async (req: Request, _res: Response, next: NextFunction) => {
    const key = req.headers.cookie;
    const cached = cache && key ? cache.get(key) : undefined;
    if (cached) {
      req.actor = cached;
      return next();
    }
    const generation = cache?.generation ?? 0;
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
    if (cache && key) cache.set(key, req.actor, session.session.expiresAt, generation);
    next();
  };
}

/** Lets the request through only for roles that hold the right (checked after requireSession). */
export function allow(right: Right): RequestHandler {
  return (req, _res, next) => {
    const actor = req.actor;
    if (!actor) throw unauthorized();
    if (!can(actor.role, right)) throw forbidden();
    next();
  };
}

export function actorOf(req: Request): Actor {
  if (!req.actor) throw unauthorized();
  return req.actor;
}
