/**
 * The life of a supplier tolerance report: built from an approved revision and a finished
 * study, changed or discarded while a draft, released by a reviewer (its files stored byte
 * for byte), acknowledged by the supplier, and discussed in comments.
 */
import { and, desc, eq, sql } from "drizzle-orm";
import { alias } from "drizzle-orm/pg-core";
import type { CreateReport, Report, UpdateReport } from "@shared/schemas/reports";
import type { Database } from "../db/client";
import { comments, projects, reportFiles, reports, stackRevisions, users } from "../db/schema";
import { badRequest, conflict, found, HttpError, isUniqueViolation } from "../lib/errors";
import { deleteVersioned, requireVersion, writeVersioned } from "../lib/versions";
import type { Actor } from "../middleware/session";
import { recordActivity } from "./activity";
import { assertProjectOpen } from "./project-records";
import { buildReportContent } from "./report-content";
import { FILE_TYPES, fileName, metaFor, sha256 } from "./report-files";
import type { ReportRenderer } from "./report-renderer";
import { getReport, reportLabel, visibleRow, type ReportRow } from "./report-queries";
import { listComments } from "./revisions";
import { getStudy } from "./studies";
import { getSupplier } from "./suppliers";
import { reportCode } from "@shared/reports/format";

const approver = alias(users, "revision_approver");

/** A PNG data URL → its bytes, refusing anything that is not a plausible PNG image. */
export function decodeSnapshot(dataUrl: string): Buffer {
  const bytes = Buffer.from(dataUrl.slice(dataUrl.indexOf(",") + 1), "base64");
  const signature = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
  const field = (message: string) => badRequest("The 3D snapshot is not usable.", [{ path: "snapshotPng", message }]);
  if (bytes.length < 33 || !bytes.subarray(0, 8).equals(signature) || bytes.toString("latin1", 12, 16) !== "IHDR")
    throw field("not a PNG image");
  const w = bytes.readUInt32BE(16);
  const h = bytes.readUInt32BE(20);
  if (w < 16 || h < 16 || w > 8192 || h > 8192) throw field(`a ${w} × ${h} image is outside 16 to 8192 pixels a side`);
  return bytes;
}

async function inputsFor(
  db: Database,
  actor: Actor,
  studyId: string,
  supplierId: string,
  capability: { cpk: number; overrides: Record<string, number> },
) {
  const study = await getStudy(db, actor.workspaceId, studyId);
  const [rev] = await db
    .select({ revision: stackRevisions, approvedByName: approver.name, projectName: projects.name })
    .from(stackRevisions)
    .innerJoin(projects, eq(projects.id, stackRevisions.projectId))
    .leftJoin(approver, eq(approver.id, stackRevisions.approvedBy))
    .where(and(eq(stackRevisions.workspaceId, actor.workspaceId), eq(stackRevisions.id, study.revisionId)));
  const revision = found(rev, "The stack revision");
  let supplier;
  try {
    supplier = await getSupplier(db, actor.workspaceId, supplierId);
  } catch (e) {
    if (e instanceof HttpError && e.status === 404)
      throw badRequest("The supplier company does not exist.", [{ path: "supplierId", message: "no such supplier in this workspace" }]);
    throw e;
  }
  return {
    project: { id: revision.revision.projectId, name: revision.projectName },
    revision: {
      id: revision.revision.id,
      number: revision.revision.number,
      status: revision.revision.status,
      stack: revision.revision.stack,
      approvedAt: revision.revision.approvedAt,
      approvedByName: revision.approvedByName,
    },
    study,
    supplier: { id: supplier.id, name: supplier.name, kind: supplier.kind },
    capability,
  };
}

export async function createReport(db: Database, actor: Actor, studyId: string, input: CreateReport, baseURL: string): Promise<Report> {
  const capability = { cpk: input.cpk, overrides: input.cpkOverrides };
  const inputs = await inputsFor(db, actor, studyId, input.supplierId, capability);
  await assertProjectOpen(db, actor.workspaceId, inputs.project.id);
  const content = buildReportContent(inputs);
  const snapshot = input.snapshotPng ? decodeSnapshot(input.snapshotPng) : null;
  let id: string;
  try {
    id = await db.transaction(async (tx) => {
      const [latest] = await tx
        .select({ id: reports.id, number: reports.number, revision: reports.revision, status: reports.status })
        .from(reports)
        .where(
          and(
            eq(reports.workspaceId, actor.workspaceId),
            eq(reports.projectId, inputs.project.id),
            eq(reports.supplierId, inputs.supplier.id),
          ),
        )
        .orderBy(desc(reports.revision))
        .limit(1);
      if (latest?.status === "draft") {
        throw conflict(
          `${reportCode(latest.number)} revision ${latest.revision} for ${inputs.supplier.name} is still a draft. Change it, or discard it, before building another revision.`,
          "draft_exists",
        );
      }
      const [{ next }] = await tx
        .select({ next: sql<number>`coalesce(max(${reports.number}), 0)::int + 1` })
        .from(reports)
        .where(eq(reports.workspaceId, actor.workspaceId));
      const number = latest ? latest.number : next;
      const revision = latest ? latest.revision + 1 : 1;
      const [row] = await tx
        .insert(reports)
        .values({
          workspaceId: actor.workspaceId,
          projectId: inputs.project.id,
          supplierId: inputs.supplier.id,
          studyId: inputs.study.id,
          revisionId: inputs.revision.id,
          number,
          revision,
          capability,
          content,
          note: input.note,
          snapshotPng: snapshot,
          createdBy: actor.userId,
        })
        .returning({ id: reports.id });
      await recordActivity(tx, {
        workspaceId: actor.workspaceId,
        projectId: inputs.project.id,
        actorId: actor.userId,
        action: "report.created",
        summary: `built ${reportLabel({ number, revision })} for ${inputs.supplier.name} from study ${inputs.study.number} (${content.tolerances.length} tolerances, Cpk ≥ ${capability.cpk})`,
        data: { reportId: row.id },
      });
      return row.id;
    });
  } catch (e) {
    if (isUniqueViolation(e)) throw conflict("Another report was built at the same moment. Try again.", "concurrent_change");
    throw e;
  }
  return getReport(db, actor, id, baseURL);
}

const titleOf = (row: ReportRow) => `${reportCode(row.number)} revision ${row.revision}`;

function assertDraft(row: ReportRow) {
  if (row.status !== "draft") {
    throw conflict(
      `${reportCode(row.number)} revision ${row.revision} is released and frozen. Build a new revision to change it.`,
      "report_frozen",
    );
  }
}

export async function updateReport(db: Database, actor: Actor, id: string, input: UpdateReport, baseURL: string, sent: number | undefined) {
  const row = await visibleRow(db, actor, id);
  await assertProjectOpen(db, actor.workspaceId, row.projectId);
  const expected = requireVersion(titleOf(row), row.version, sent);
  assertDraft(row);
  if (!row.studyId || !row.supplierId)
    throw conflict("The study or the supplier of this draft was deleted. Discard it and build a new one.", "not_reportable");
  const capability = { cpk: input.cpk ?? row.capability.cpk, overrides: input.cpkOverrides ?? row.capability.overrides };
  const content = buildReportContent(await inputsFor(db, actor, row.studyId, row.supplierId, capability));
  const snapshot =
    input.snapshotPng === undefined ? row.snapshotPng : input.snapshotPng === null ? null : decodeSnapshot(input.snapshotPng);
  await db.transaction(async (tx) => {
    await writeVersioned(
      tx,
      reports,
      id,
      expected,
      titleOf(row),
      { capability, content, note: input.note ?? row.note, snapshotPng: snapshot },
      { where: eq(reports.status, "draft"), otherwise: () => conflict("The report was released meanwhile; reload it.", "report_frozen") },
    );
    await recordActivity(tx, {
      workspaceId: actor.workspaceId,
      projectId: row.projectId,
      actorId: actor.userId,
      action: "report.updated",
      summary: `changed the draft of ${reportLabel(row)}`,
      data: { reportId: id },
    });
  });
  return getReport(db, actor, id, baseURL);
}

/** Discards a draft, on the version the caller last read (`sent`: none is a 428, a stale one a 409). */
export async function deleteReport(db: Database, actor: Actor, id: string, sent: number | undefined) {
  const row = await visibleRow(db, actor, id);
  await assertProjectOpen(db, actor.workspaceId, row.projectId);
  assertDraft(row);
  const expected = requireVersion(titleOf(row), row.version, sent);
  await db.transaction(async (tx) => {
    await deleteVersioned(tx, reports, id, expected, titleOf(row), {
      where: eq(reports.status, "draft"),
      otherwise: () => conflict("The report was released meanwhile; it can no longer be discarded.", "report_frozen"),
    });
    await tx.delete(comments).where(and(eq(comments.targetType, "report"), eq(comments.targetId, id)));
    await recordActivity(tx, {
      workspaceId: actor.workspaceId,
      projectId: row.projectId,
      actorId: actor.userId,
      action: "report.deleted",
      summary: `discarded the draft of ${reportLabel(row)}`,
      data: { reportId: id },
    });
  });
}

export async function releaseReport(
  db: Database,
  renderer: ReportRenderer,
  actor: Actor,
  id: string,
  comment: string | undefined,
  baseURL: string,
  sent: number | undefined,
) {
  const row = await visibleRow(db, actor, id);
  await assertProjectOpen(db, actor.workspaceId, row.projectId);
  const expected = requireVersion(titleOf(row), row.version, sent);
  assertDraft(row);
  const c = row.content;
  if (row.revisionId) {
    // the revision cannot lose its approval today, but the report must never outlive it silently
    const [rev] = await db
      .select({ status: stackRevisions.status, number: stackRevisions.number })
      .from(stackRevisions)
      .where(eq(stackRevisions.id, row.revisionId));
    if (rev && rev.status !== "approved")
      throw conflict(`Stack revision ${rev.number} is no longer approved; this report cannot be released.`, "not_reportable");
  }
  const releasedAt = new Date();
  const meta = await metaFor(db, row, baseURL, { status: "released", releasedAt: releasedAt.toISOString(), releasedByName: actor.name });
  const rendered = await Promise.all(
    (["pdf", "xlsx", "csv"] as const).map(async (kind) => ({ kind, data: await renderer.render(row.content, meta, kind) })),
  );
  await db.transaction(async (tx) => {
    await writeVersioned(
      tx,
      reports,
      id,
      expected,
      titleOf(row),
      { status: "released", releasedAt, releasedBy: actor.userId },
      { where: eq(reports.status, "draft"), otherwise: () => conflict("The report was released meanwhile.", "report_frozen") },
    );
    await tx.insert(reportFiles).values(
      rendered.map((f) => ({
        reportId: id,
        kind: f.kind,
        fileName: fileName(row, f.kind),
        contentType: FILE_TYPES[f.kind],
        data: f.data,
        size: f.data.length,
        sha256: sha256(f.data),
      })),
    );
    await tx.insert(comments).values({
      workspaceId: actor.workspaceId,
      projectId: row.projectId,
      targetType: "report",
      targetId: id,
      authorId: actor.userId,
      kind: "released",
      body: comment || "Released.",
    });
    await recordActivity(tx, {
      workspaceId: actor.workspaceId,
      projectId: row.projectId,
      actorId: actor.userId,
      action: "report.released",
      summary: `released ${reportLabel(row)} for ${c.supplier.name}`,
      data: { reportId: id, sha256: sha256(rendered[0].data) },
    });
  });
  return getReport(db, actor, id, baseURL);
}

export async function acknowledgeReport(
  db: Database,
  actor: Actor,
  id: string,
  comment: string | undefined,
  baseURL: string,
  sent: number | undefined,
) {
  const row = await visibleRow(db, actor, id);
  const expected = requireVersion(titleOf(row), row.version, sent);
  if (row.acknowledgedAt)
    throw conflict(`${reportCode(row.number)} revision ${row.revision} is already acknowledged.`, "already_acknowledged");
  const c = row.content;
  await db.transaction(async (tx) => {
    await writeVersioned(
      tx,
      reports,
      id,
      expected,
      titleOf(row),
      { acknowledgedAt: new Date(), acknowledgedBy: actor.userId },
      {
        where: and(eq(reports.status, "released"), sql`${reports.acknowledgedAt} is null`),
        otherwise: () => conflict("The report was acknowledged meanwhile.", "already_acknowledged"),
      },
    );
    await tx.insert(comments).values({
      workspaceId: actor.workspaceId,
      projectId: row.projectId,
      targetType: "report",
      targetId: id,
      authorId: actor.userId,
      kind: "acknowledged",
      body: comment || "Acknowledged.",
    });
    await recordActivity(tx, {
      workspaceId: actor.workspaceId,
      projectId: row.projectId,
      actorId: actor.userId,
      action: "report.acknowledged",
      summary: `of ${c.supplier.name} acknowledged ${reportLabel(row)}${comment ? `: “${comment.slice(0, 140)}”` : ""}`,
      data: { reportId: id },
    });
  });
  return getReport(db, actor, id, baseURL);
}

/** A supplier asks a question; staff answer or discuss. Both land on the report and in the activity. */
export async function addReportComment(db: Database, actor: Actor, id: string, body: string) {
  const row = await visibleRow(db, actor, id);
  const question = actor.role === "supplier";
  // the supplier's side of a released report goes on; the staff's discussion stops with the archive
  if (!question) await assertProjectOpen(db, actor.workspaceId, row.projectId);
  await db.transaction(async (tx) => {
    await tx.insert(comments).values({
      workspaceId: actor.workspaceId,
      projectId: row.projectId,
      targetType: "report",
      targetId: id,
      authorId: actor.userId,
      kind: question ? "question" : "comment",
      body,
    });
    await recordActivity(tx, {
      workspaceId: actor.workspaceId,
      projectId: row.projectId,
      actorId: actor.userId,
      action: question ? "report.question" : "report.commented",
      summary: `${question ? "asked a question on" : "commented on"} ${reportLabel(row)}: “${body.slice(0, 140)}”`,
      data: { reportId: id },
    });
  });
  const all = await listComments(db, "report", id);
  const releasedAt = row.releasedAt?.getTime() ?? Infinity;
  return question ? all.filter((c) => c.kind !== "released" && Date.parse(c.createdAt) >= releasedAt) : all;
}

/** A reviewer sends a draft back with what must change; it stays a draft, the comment is kept. */
export async function returnReport(db: Database, actor: Actor, id: string, comment: string, baseURL: string, sent: number | undefined) {
  const row = await visibleRow(db, actor, id);
  await assertProjectOpen(db, actor.workspaceId, row.projectId);
  const expected = requireVersion(titleOf(row), row.version, sent);
  assertDraft(row);
  await db.transaction(async (tx) => {
    // sending back is a change of the draft: an engineer's edit made on the version before it is stale
    await writeVersioned(
      tx,
      reports,
      id,
      expected,
      titleOf(row),
      {},
      {
        where: eq(reports.status, "draft"),
        otherwise: () => conflict("The report was released meanwhile.", "report_frozen"),
      },
    );
    await tx.insert(comments).values({
      workspaceId: actor.workspaceId,
      projectId: row.projectId,
      targetType: "report",
      targetId: id,
      authorId: actor.userId,
      kind: "returned",
      body: comment,
    });
    await recordActivity(tx, {
      workspaceId: actor.workspaceId,
      projectId: row.projectId,
      actorId: actor.userId,
      action: "report.returned",
      summary: `sent the draft of ${reportLabel(row)} back: “${comment.slice(0, 140)}”`,
      data: { reportId: id },
    });
  });
  return getReport(db, actor, id, baseURL);
}
