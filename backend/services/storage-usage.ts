import { eq, sql } from "drizzle-orm";
import type { Database } from "../db/client";
import { datasets, reportFiles, reports } from "../db/schema";
import { HttpError } from "../lib/errors";

const MB = 1024 * 1024;

/** Bytes a workspace keeps in uploaded data sets and stored report files. */
export async function workspaceUsage(db: Database, workspaceId: string): Promise<number> {
  const [d] = await db
    .select({ n: sql<string>`coalesce(sum(${datasets.sizeBytes}), 0)` })
    .from(datasets)
    .where(eq(datasets.workspaceId, workspaceId));
  const [r] = await db
    .select({ n: sql<string>`coalesce(sum(${reportFiles.size}), 0)` })
    .from(reportFiles)
    .innerJoin(reports, eq(reports.id, reportFiles.reportId))
    .where(eq(reports.workspaceId, workspaceId));
  return Number(d?.n ?? 0) + Number(r?.n ?? 0);
}

/** Refuses a write that would take the workspace past its quota: 507, saying how much is used. */
export async function assertQuota(db: Database, workspaceId: string, bytes: number, quotaBytes: number): Promise<void> {
  const used = await workspaceUsage(db, workspaceId);
  if (used + bytes > quotaBytes) {
    const mb = (n: number) => (n / MB).toFixed(1);
    throw new HttpError(
      507,
      "quota_exceeded",
      `This workspace keeps ${mb(used)} MB of uploads and report files; ${mb(bytes)} MB more would pass its quota of ${mb(quotaBytes)} MB. Nothing was stored. Delete data sets you no longer need, or ask your administrator to raise WORKSPACE_QUOTA_MB.`,
    );
  }
}
