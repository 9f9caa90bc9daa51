/**
 * A report's files: PDF, spreadsheet and CSV rendered from the frozen content. A released
 * report's files are stored once at release and served byte for byte; a draft's are made on
 * each download and marked DRAFT.
 */
import { createHash } from "node:crypto";
import { and, eq } from "drizzle-orm";
import type { ReportFileKind } from "@shared/schemas/reports";
import type { Database } from "../db/client";
import { reportDownloads, reportFiles, users } from "../db/schema";
import { found } from "../lib/errors";
import type { Actor } from "../middleware/session";
import { recordActivity } from "./activity";
import type { ReportMeta } from "./report-pdf";
import { iso, reportLabel, reportLink, visibleRow, type ReportRow } from "./report-queries";
import type { ReportRenderer } from "./report-renderer";
import { safeFileName } from "./report-format";
import { reportCode } from "@shared/reports/format";

export const FILE_TYPES: Record<ReportFileKind, string> = {
  pdf: "application/pdf",
  xlsx: "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet",
  csv: "text/csv; charset=utf-8",
};

export const sha256 = (b: Buffer) => createHash("sha256").update(b).digest("hex");

export async function metaFor(db: Database, row: ReportRow, baseURL: string, override?: Partial<ReportMeta>): Promise<ReportMeta> {
  const ids = [row.createdBy, row.releasedBy].filter((x): x is string => !!x);
  const names = new Map<string, string>();
  for (const uid of ids) {
    const [u] = await db.select({ name: users.name }).from(users).where(eq(users.id, uid));
    if (u) names.set(uid, u.name);
  }
  return {
    code: reportCode(row.number),
    revision: row.revision,
    status: row.status,
    createdAt: row.createdAt.toISOString(),
    createdByName: row.createdBy ? (names.get(row.createdBy) ?? null) : null,
    releasedAt: iso(row.releasedAt),
    releasedByName: row.releasedBy ? (names.get(row.releasedBy) ?? null) : null,
    link: reportLink(baseURL, row.id),
    note: row.note,
    snapshot: row.snapshotPng,
    ...override,
  };
}

export function fileName(row: ReportRow, kind: ReportFileKind) {
  const c = row.content;
  return `${reportCode(row.number)}-r${row.revision}-${safeFileName(c.supplier.name)}.${kind}`;
}

/**
 * A report file to download: a released report's stored bytes exactly, or a draft rendered
 * now (marked as a draft). Every download is recorded; a supplier's also in the project's activity.
 */
export async function reportFile(db: Database, renderer: ReportRenderer, actor: Actor, id: string, kind: ReportFileKind, baseURL: string) {
  const row = await visibleRow(db, actor, id);
  let file: { data: Buffer; sha256: string | null; fileName: string; contentType: string };
  if (row.status === "released") {
    const [stored] = await db
      .select()
      .from(reportFiles)
      .where(and(eq(reportFiles.reportId, id), eq(reportFiles.kind, kind)));
    const f = found(stored, "The report file");
    file = { data: f.data, sha256: f.sha256, fileName: f.fileName, contentType: f.contentType };
  } else {
    const data = await renderer.render(row.content, await metaFor(db, row, baseURL), kind);
    file = { data, sha256: null, fileName: fileName(row, kind).replace(/(\.\w+)$/, "-DRAFT$1"), contentType: FILE_TYPES[kind] };
  }
  await db.transaction(async (tx) => {
    await tx.insert(reportDownloads).values({ reportId: id, userId: actor.userId, role: actor.role, kind });
    if (actor.role === "supplier") {
      const c = row.content;
      await recordActivity(tx, {
        workspaceId: actor.workspaceId,
        projectId: row.projectId,
        actorId: actor.userId,
        action: "report.downloaded",
        summary: `of ${c.supplier.name} downloaded ${reportLabel(row)} (${kind.toUpperCase()})`,
        data: { reportId: id, kind },
      });
    }
  });
  return file;
}
