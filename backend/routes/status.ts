import { Router } from "express";
import { and, eq, inArray, sql } from "drizzle-orm";
import { ServerStatusSchema } from "@shared/schemas/server-status";
import type { AppDeps } from "../deps";
import { studies } from "../db/schema";
import { send } from "../lib/respond";
import { actorOf, allow } from "../middleware/session";

/** The admin's status page: where this workspace's studies run and how busy that is. */
export function statusRouter(deps: AppDeps, startedAt = new Date()) {
  const r = Router();
  r.get("/status", allow("status.read"), async (req, res) => {
    const { workspaceId } = actorOf(req);
    const rows = await deps.db
      .select({ status: studies.status, n: sql<number>`count(*)::int` })
      .from(studies)
      .where(and(eq(studies.workspaceId, workspaceId), inArray(studies.status, ["queued", "running"])))
      .groupBy(studies.status);
    const count = (s: string) => rows.find((x) => x.status === s)?.n ?? 0;
    send(res, ServerStatusSchema, {
      startedAt: startedAt.toISOString(),
      studies: { queued: count("queued"), running: count("running") },
      engine: { threads: deps.enginePool.size, activeStudies: deps.enginePool.activeStudies },
      queue: deps.queueStatus ? await deps.queueStatus() : null,
    });
  });
  return r;
}
