import { desc, eq, and } from "drizzle-orm";
import type { Database } from "../db/client";
import { activities, users } from "../db/schema";

type Executor = Pick<Database, "insert">;

export async function recordActivity(
  db: Executor,
  entry: {
    workspaceId: string;
    projectId?: string | null;
    actorId?: string | null;
    action: string;
    summary: string;
    data?: Record<string, unknown>;
  },
) {
  await db.insert(activities).values({
    workspaceId: entry.workspaceId,
    projectId: entry.projectId ?? null,
    actorId: entry.actorId ?? null,
    action: entry.action,
    summary: entry.summary,
    data: entry.data ?? {},
  });
}

export async function listProjectActivity(db: Database, workspaceId: string, projectId: string, limit = 100) {
  const rows = await db
    .select({
      id: activities.id,
      projectId: activities.projectId,
      actorName: users.name,
      action: activities.action,
      summary: activities.summary,
      createdAt: activities.createdAt,
    })
    .from(activities)
    .leftJoin(users, eq(users.id, activities.actorId))
    .where(and(eq(activities.workspaceId, workspaceId), eq(activities.projectId, projectId)))
    .orderBy(desc(activities.createdAt))
    .limit(limit);
  return rows.map((r) => ({ ...r, createdAt: r.createdAt.toISOString() }));
}
