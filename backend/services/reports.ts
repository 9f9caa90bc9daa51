/**
 * Supplier tolerance reports: built from an approved revision and a finished study, a draft
 * until a reviewer releases it, then frozen with its files stored byte for byte; sent to the
 * supplier's contacts, downloaded and acknowledged by the supplier's people.
 */
import { createHash } from "node:crypto";
import { and, asc, desc, eq, sql } from "drizzle-orm";
import { alias } from "drizzle-orm/pg-core";
import { REPORT_CAUTIONS } from "@shared/reports/cautions";
import { matchOwner, toleranceSources } from "@shared/reports/sources";
import type { CreateReport, Report, ReportContent, ReportFileKind, ReportOptions, ReportSummary, SendResult, UpdateReport } from "@shared/schemas/reports";
import type { StackFile } from "@shared/schemas/stack-file";
import type { Database } from "../db/client";
import { comments, projects, reportDownloads, reportFiles, reports, reportSends, stackRevisions, studies, studyResults, supplierContacts, suppliers, users } from "../db/schema";
import { badRequest, conflict, found, HttpError, notFound } from "../lib/errors";
import type { Actor } from "../middleware/session";
import { recordActivity } from "./activity";
import { requireMail } from "./mail";
import { buildReportContent, reportBlocker } from "./report-content";
import { reportCode, safeFileName } from "./report-format";
import { renderReportPdf, type ReportMeta } from "./report-pdf";
import { renderReportCsv, renderReportXlsx } from "./report-sheets";
import { listComments } from "./revisions";
import { getStudy } from "./studies";
import { getSupplier } from "./suppliers";

const creator = alias(users, "report_creator");
const releaser = alias(users, "report_releaser");
const acker = alias(users, "report_acker");
const approver = alias(users, "revision_approver");

const FILE_TYPES: Record<ReportFileKind, string> = {
  pdf: "application/pdf",
  xlsx: "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet",
  csv: "text/csv; charset=utf-8",
};

const iso = (d: Date | null) => (d ? d.toISOString() : null);
const sha256 = (b: Buffer) => createHash("sha256").update(b).digest("hex");
export const reportLink = (baseURL: string, id: string) => `${baseURL.replace(/\/$/, "")}/reports/${id}`;
const label = (r: { number: number; revision: number }) => `report ${reportCode(r.number)} revision ${r.revision}`;

const isUniqueViolation = (e: unknown) => {
  const err = e as { code?: string; cause?: { code?: string } };
  return err?.code === "23505" || err?.cause?.code === "23505";
};

// ---- reading ----------------------------------------------------------------------

type ReportRow = typeof reports.$inferSelect;

/** The report if this actor may see it: staff see their workspace's, suppliers only their company's released ones. */
async function visibleRow(db: Database, actor: Actor, id: string): Promise<ReportRow> {
  const [row] = await db.select().from(reports).where(and(eq(reports.workspaceId, actor.workspaceId), eq(reports.id, id)));
  // a supplier learns nothing about reports that are not theirs: the same 404 as a missing one
  if (!row || (actor.role === "supplier" && (row.status !== "released" || !actor.supplierId || row.supplierId !== actor.supplierId))) {
    throw notFound("The report");
  }
  return row;
}

function summaryQuery(db: Database, supplierView: boolean) {
  const later = supplierView
    ? sql<boolean>`not exists (select 1 from reports r2 where r2.workspace_id = ${reports.workspaceId} and r2.number = ${reports.number} and r2.revision > ${reports.revision} and r2.status = 'released')`
    : sql<boolean>`not exists (select 1 from reports r2 where r2.workspace_id = ${reports.workspaceId} and r2.number = ${reports.number} and r2.revision > ${reports.revision})`;
  return db
    .select({
      row: reports,
      projectName: projects.name,
      createdByName: creator.name,
      releasedByName: releaser.name,
      acknowledgedByName: acker.name,
      isLatest: later,
      lastSentAt: sql<string | null>`(select max(s.created_at) from report_sends s where s.report_id = ${reports.id})`,
    })
    .from(reports)
    .innerJoin(projects, eq(projects.id, reports.projectId))
    .leftJoin(creator, eq(creator.id, reports.createdBy))
    .leftJoin(releaser, eq(releaser.id, reports.releasedBy))
    .leftJoin(acker, eq(acker.id, reports.acknowledgedBy));
}

type SummaryRecord = Awaited<ReturnType<ReturnType<typeof summaryQuery>["execute"]>>[number];

function toSummary(r: SummaryRecord): ReportSummary {
  const c = r.row.content as unknown as ReportContent;
  return {
    id: r.row.id,
    code: reportCode(r.row.number),
    number: r.row.number,
    revision: r.row.revision,
    status: r.row.status,
    projectId: r.row.projectId,
    projectName: r.projectName,
    supplierId: r.row.supplierId,
    supplierName: c.supplier.name,
    studyId: r.row.studyId,
    studyNumber: c.study.number,
    stackRevisionNumber: c.revision.number,
    toleranceCount: c.tolerances.length,
    cpk: r.row.capability.cpk,
    isLatest: Boolean(r.isLatest),
    createdAt: r.row.createdAt.toISOString(),
    createdByName: r.createdByName,
    releasedAt: iso(r.row.releasedAt),
    releasedByName: r.releasedByName,
    acknowledgedAt: iso(r.row.acknowledgedAt),
    acknowledgedByName: r.acknowledgedByName,
    lastSentAt: r.lastSentAt ? new Date(r.lastSentAt).toISOString() : null,
  };
}

export async function listReports(db: Database, actor: Actor, query: { projectId?: string; supplierId?: string; status?: "draft" | "released" }) {
  const supplierView = actor.role === "supplier";
  if (supplierView && !actor.supplierId) return [];
  const rows = await summaryQuery(db, supplierView)
    .where(
      and(
        eq(reports.workspaceId, actor.workspaceId),
        query.projectId ? eq(reports.projectId, query.projectId) : undefined,
        supplierView ? eq(reports.supplierId, actor.supplierId!) : query.supplierId ? eq(reports.supplierId, query.supplierId) : undefined,
        supplierView ? eq(reports.status, "released") : query.status ? eq(reports.status, query.status) : undefined,
      ),
    )
    .orderBy(desc(reports.number), desc(reports.revision));
  return rows.map(toSummary);
}

export async function getReport(db: Database, actor: Actor, id: string, baseURL: string): Promise<Report> {
  const visible = await visibleRow(db, actor, id);
  const [r] = await summaryQuery(db, actor.role === "supplier").where(eq(reports.id, visible.id));
  const supplierView = actor.role === "supplier";
  const [files, sends, downloads, history, commentList] = await Promise.all([
    db
      .select({ kind: reportFiles.kind, fileName: reportFiles.fileName, size: reportFiles.size, sha256: reportFiles.sha256, createdAt: reportFiles.createdAt })
      .from(reportFiles)
      .where(eq(reportFiles.reportId, id))
      .orderBy(asc(reportFiles.kind)),
    supplierView
      ? Promise.resolve([])
      : db
          .select({ id: reportSends.id, createdAt: reportSends.createdAt, sentByName: users.name, recipients: reportSends.recipients, message: reportSends.message })
          .from(reportSends)
          .leftJoin(users, eq(users.id, reportSends.sentBy))
          .where(eq(reportSends.reportId, id))
          .orderBy(desc(reportSends.createdAt)),
    supplierView
      ? Promise.resolve([])
      : db
          .select({ createdAt: reportDownloads.createdAt, userName: users.name, role: reportDownloads.role, kind: reportDownloads.kind })
          .from(reportDownloads)
          .leftJoin(users, eq(users.id, reportDownloads.userId))
          .where(eq(reportDownloads.reportId, id))
          .orderBy(desc(reportDownloads.createdAt))
          .limit(100),
    db
      .select({ id: reports.id, revision: reports.revision, status: reports.status, createdAt: reports.createdAt, releasedAt: reports.releasedAt })
      .from(reports)
      .where(and(eq(reports.workspaceId, visible.workspaceId), eq(reports.number, visible.number), supplierView ? eq(reports.status, "released") : undefined))
      .orderBy(desc(reports.revision)),
    listComments(db, "report", id),
  ]);
  // Review notes on the draft and the release note are internal; the supplier sees the
  // conversation from the release on (its questions, the answers, its acknowledgement).
  const releasedAt = visible.releasedAt?.getTime() ?? Infinity;
  const shownComments = supplierView ? commentList.filter((c) => c.kind !== "released" && Date.parse(c.createdAt) >= releasedAt) : commentList;
  return {
    ...toSummary(r),
    capability: visible.capability,
    note: visible.note,
    hasSnapshot: visible.snapshotPng !== null,
    content: visible.content as unknown as ReportContent,
    files: files.map((f) => ({ ...f, createdAt: f.createdAt.toISOString() })),
    sends: sends.map((s) => ({ id: s.id, sentAt: s.createdAt.toISOString(), sentByName: s.sentByName, recipients: s.recipients, message: s.message })),
    downloads: downloads.map((d) => ({ at: d.createdAt.toISOString(), userName: d.userName, role: d.role, kind: d.kind })),
    comments: shownComments,
    history: history.map((h) => ({ id: h.id, revision: h.revision, status: h.status, createdAt: h.createdAt.toISOString(), releasedAt: iso(h.releasedAt) })),
    link: reportLink(baseURL, id),
  };
}

// ---- building ---------------------------------------------------------------------

/** A PNG data URL → its bytes, refusing anything that is not a plausible PNG image. */
export function decodeSnapshot(dataUrl: string): Buffer {
  const bytes = Buffer.from(dataUrl.slice(dataUrl.indexOf(",") + 1), "base64");
  const signature = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
  const field = (message: string) => badRequest("The 3D snapshot is not usable.", [{ path: "snapshotPng", message }]);
  if (bytes.length < 33 || !bytes.subarray(0, 8).equals(signature) || bytes.toString("latin1", 12, 16) !== "IHDR") throw field("not a PNG image");
  const w = bytes.readUInt32BE(16);
  const h = bytes.readUInt32BE(20);
  if (w < 16 || h < 16 || w > 8192 || h > 8192) throw field(`a ${w} × ${h} image is outside 16 to 8192 pixels a side`);
  return bytes;
}

async function inputsFor(db: Database, actor: Actor, studyId: string, supplierId: string, capability: { cpk: number; overrides: Record<string, number> }) {
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
    if (e instanceof HttpError && e.status === 404) throw badRequest("The supplier company does not exist.", [{ path: "supplierId", message: "no such supplier in this workspace" }]);
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
  const content = buildReportContent(inputs);
  const snapshot = input.snapshotPng ? decodeSnapshot(input.snapshotPng) : null;
  let id: string;
  try {
    id = await db.transaction(async (tx) => {
      const [latest] = await tx
        .select({ id: reports.id, number: reports.number, revision: reports.revision, status: reports.status })
        .from(reports)
        .where(and(eq(reports.workspaceId, actor.workspaceId), eq(reports.projectId, inputs.project.id), eq(reports.supplierId, inputs.supplier.id)))
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
          content: content as unknown as Record<string, unknown>,
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
        summary: `built ${label({ number, revision })} for ${inputs.supplier.name} from study ${inputs.study.number} (${content.tolerances.length} tolerances, Cpk ≥ ${capability.cpk})`,
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

function assertDraft(row: ReportRow) {
  if (row.status !== "draft") {
    throw conflict(`${reportCode(row.number)} revision ${row.revision} is released and frozen. Build a new revision to change it.`, "report_frozen");
  }
}

export async function updateReport(db: Database, actor: Actor, id: string, input: UpdateReport, baseURL: string) {
  const row = await visibleRow(db, actor, id);
  assertDraft(row);
  if (!row.studyId || !row.supplierId) throw conflict("The study or the supplier of this draft was deleted. Discard it and build a new one.", "not_reportable");
  const capability = { cpk: input.cpk ?? row.capability.cpk, overrides: input.cpkOverrides ?? row.capability.overrides };
  const content = buildReportContent(await inputsFor(db, actor, row.studyId, row.supplierId, capability));
  const snapshot = input.snapshotPng === undefined ? row.snapshotPng : input.snapshotPng === null ? null : decodeSnapshot(input.snapshotPng);
  await db.transaction(async (tx) => {
    const changed = await tx
      .update(reports)
      .set({ capability, content: content as unknown as Record<string, unknown>, note: input.note ?? row.note, snapshotPng: snapshot })
      .where(and(eq(reports.id, id), eq(reports.status, "draft")))
      .returning({ id: reports.id });
    if (!changed.length) throw conflict("The report was released meanwhile; reload it.", "report_frozen");
    await recordActivity(tx, {
      workspaceId: actor.workspaceId,
      projectId: row.projectId,
      actorId: actor.userId,
      action: "report.updated",
      summary: `changed the draft of ${label(row)}`,
      data: { reportId: id },
    });
  });
  return getReport(db, actor, id, baseURL);
}

export async function deleteReport(db: Database, actor: Actor, id: string) {
  const row = await visibleRow(db, actor, id);
  assertDraft(row);
  await db.transaction(async (tx) => {
    const gone = await tx.delete(reports).where(and(eq(reports.id, id), eq(reports.status, "draft"))).returning({ id: reports.id });
    if (!gone.length) throw conflict("The report was released meanwhile; it can no longer be discarded.", "report_frozen");
    await tx.delete(comments).where(and(eq(comments.targetType, "report"), eq(comments.targetId, id)));
    await recordActivity(tx, {
      workspaceId: actor.workspaceId,
      projectId: row.projectId,
      actorId: actor.userId,
      action: "report.deleted",
      summary: `discarded the draft of ${label(row)}`,
      data: { reportId: id },
    });
  });
}

// ---- files ----------------------------------------------------------------------------

async function metaFor(db: Database, row: ReportRow, baseURL: string, override?: Partial<ReportMeta>): Promise<ReportMeta> {
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

function fileName(row: ReportRow, kind: ReportFileKind) {
  const c = row.content as unknown as ReportContent;
  return `${reportCode(row.number)}-r${row.revision}-${safeFileName(c.supplier.name)}.${kind}`;
}

async function render(row: ReportRow, meta: ReportMeta, kind: ReportFileKind): Promise<Buffer> {
  const c = row.content as unknown as ReportContent;
  if (kind === "pdf") return renderReportPdf(c, meta);
  if (kind === "xlsx") return renderReportXlsx(c, meta);
  return renderReportCsv(c, meta);
}

/**
 * A report file to download: a released report's stored bytes exactly, or a draft rendered
 * now (marked as a draft). Every download is recorded; a supplier's also in the project's activity.
 */
export async function reportFile(db: Database, actor: Actor, id: string, kind: ReportFileKind, baseURL: string) {
  const row = await visibleRow(db, actor, id);
  let file: { data: Buffer; sha256: string | null; fileName: string; contentType: string };
  if (row.status === "released") {
    const [stored] = await db.select().from(reportFiles).where(and(eq(reportFiles.reportId, id), eq(reportFiles.kind, kind)));
    const f = found(stored, "The report file");
    file = { data: f.data, sha256: f.sha256, fileName: f.fileName, contentType: f.contentType };
  } else {
    const data = await render(row, await metaFor(db, row, baseURL), kind);
    file = { data, sha256: null, fileName: fileName(row, kind).replace(/(\.\w+)$/, "-DRAFT$1"), contentType: FILE_TYPES[kind] };
  }
  await db.transaction(async (tx) => {
    await tx.insert(reportDownloads).values({ reportId: id, userId: actor.userId, role: actor.role, kind });
    if (actor.role === "supplier") {
      const c = row.content as unknown as ReportContent;
      await recordActivity(tx, {
        workspaceId: actor.workspaceId,
        projectId: row.projectId,
        actorId: actor.userId,
        action: "report.downloaded",
        summary: `of ${c.supplier.name} downloaded ${label(row)} (${kind.toUpperCase()})`,
        data: { reportId: id, kind },
      });
    }
  });
  return file;
}

// ---- release, send, acknowledge, comment ---------------------------------------------------

export async function releaseReport(db: Database, actor: Actor, id: string, comment: string | undefined, baseURL: string) {
  const row = await visibleRow(db, actor, id);
  assertDraft(row);
  const c = row.content as unknown as ReportContent;
  if (row.revisionId) {
    // the revision cannot lose its approval today, but the report must never outlive it silently
    const [rev] = await db.select({ status: stackRevisions.status, number: stackRevisions.number }).from(stackRevisions).where(eq(stackRevisions.id, row.revisionId));
    if (rev && rev.status !== "approved") throw conflict(`Stack revision ${rev.number} is no longer approved; this report cannot be released.`, "not_reportable");
  }
  const releasedAt = new Date();
  const meta = await metaFor(db, row, baseURL, { status: "released", releasedAt: releasedAt.toISOString(), releasedByName: actor.name });
  const rendered = await Promise.all((["pdf", "xlsx", "csv"] as const).map(async (kind) => ({ kind, data: await render(row, meta, kind) })));
  await db.transaction(async (tx) => {
    const changed = await tx
      .update(reports)
      .set({ status: "released", releasedAt, releasedBy: actor.userId })
      .where(and(eq(reports.id, id), eq(reports.status, "draft")))
      .returning({ id: reports.id });
    if (!changed.length) throw conflict("The report was released meanwhile.", "report_frozen");
    await tx.insert(reportFiles).values(
      rendered.map((f) => ({ reportId: id, kind: f.kind, fileName: fileName(row, f.kind), contentType: FILE_TYPES[f.kind], data: f.data, size: f.data.length, sha256: sha256(f.data) })),
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
      summary: `released ${label(row)} for ${c.supplier.name}`,
      data: { reportId: id, sha256: sha256(rendered[0].data) },
    });
  });
  return getReport(db, actor, id, baseURL);
}

function mailBody(opts: { contact: string; workspace: string; sender: string; code: string; revision: number; c: ReportContent; link: string; sha: string; message?: string }) {
  const { c } = opts;
  const cpk = `Cpk ≥ ${c.capability.cpk.toFixed(2)}${Object.keys(c.capability.overrides).length || c.tolerances.some((t) => t.raised) ? " (some tolerances ask more; see the table)" : ""}`;
  const lines = [
    `Hello ${opts.contact},`,
    "",
    `${opts.workspace} has released tolerance report ${opts.code} revision ${opts.revision} for ${c.supplier.name}: the ${c.tolerances.length} tolerances your process holds on "${c.project.name}" (stack revision ${c.revision.number}), with the capability asked: ${cpk}.`,
    "",
    ...(opts.message ? [opts.message, ""] : []),
    `Open the report, acknowledge it or ask a question: ${opts.link}`,
    "",
    `The PDF is attached. Its SHA-256 checksum is ${opts.sha}; the same value is shown on the report's page.`,
    "",
    ...REPORT_CAUTIONS,
    "",
    `Sent by ${opts.sender} through Orthostack.`,
  ];
  const text = lines.join("\n");
  const esc = (s: string) => s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");
  const html = `<div style="font-family:Manrope,Segoe UI,Helvetica,Arial,sans-serif;color:#17212b;font-size:14px;line-height:1.5;max-width:620px">
<p>Hello ${esc(opts.contact)},</p>
<p>${esc(opts.workspace)} has released tolerance report <strong>${esc(opts.code)} revision ${opts.revision}</strong> for ${esc(c.supplier.name)}: the ${c.tolerances.length} tolerances your process holds on “${esc(c.project.name)}” (stack revision ${c.revision.number}), with the capability asked: <strong>${esc(cpk)}</strong>.</p>
${opts.message ? `<p style="border-left:3px solid #d9d4c7;padding-left:10px">${esc(opts.message).replace(/\n/g, "<br>")}</p>` : ""}
<p><a href="${esc(opts.link)}" style="display:inline-block;background:#17212b;color:#f7f5f0;padding:8px 14px;border-radius:6px;text-decoration:none;font-weight:600">Open the report</a></p>
<p style="color:#5d6670;font-size:12px">The PDF is attached. SHA-256: <code>${opts.sha}</code></p>
<p style="color:#5d6670;font-size:12px;border-top:1px solid #d9d4c7;padding-top:10px">${REPORT_CAUTIONS.map(esc).join(" ")}</p>
<p style="color:#8a9099;font-size:12px">Sent by ${esc(opts.sender)} through Orthostack.</p>
</div>`;
  return { text, html };
}

/** Mails each contact of the supplier the link and the stored PDF; records who received it. */
export async function sendReport(db: Database, actor: Actor, id: string, message: string | undefined, baseURL: string): Promise<SendResult> {
  const row = await visibleRow(db, actor, id);
  if (row.status !== "released") throw conflict(`${reportCode(row.number)} revision ${row.revision} is a draft. A reviewer releases it before it is sent.`, "not_released");
  if (!row.supplierId) throw conflict("The supplier company of this report was deleted; there is no one to send it to.", "no_contacts");
  const contacts = await db.select().from(supplierContacts).where(eq(supplierContacts.supplierId, row.supplierId)).orderBy(asc(supplierContacts.name));
  const c = row.content as unknown as ReportContent;
  if (contacts.length === 0) throw conflict(`${c.supplier.name} has no contacts to send to. An admin adds them on the Suppliers page.`, "no_contacts");
  const [pdf] = await db.select().from(reportFiles).where(and(eq(reportFiles.reportId, id), eq(reportFiles.kind, "pdf")));
  const file = found(pdf, "The report's PDF");
  const mail = requireMail(db);
  const link = reportLink(baseURL, id);
  const code = reportCode(row.number);
  const sent: Array<{ name: string; email: string }> = [];
  const failed: Array<{ name: string; email: string; error: string }> = [];
  for (const contact of contacts) {
    const body = mailBody({ contact: contact.name, workspace: actor.workspaceName, sender: actor.name, code, revision: row.revision, c, link, sha: file.sha256, message });
    try {
      await mail.send({
        workspaceId: actor.workspaceId,
        to: { name: contact.name, email: contact.email },
        subject: `${code} revision ${row.revision}: tolerances for ${c.project.name}`,
        text: body.text,
        html: body.html,
        attachments: [{ filename: file.fileName, content: file.data, contentType: file.contentType }],
      });
      sent.push({ name: contact.name, email: contact.email });
    } catch (e) {
      failed.push({ name: contact.name, email: contact.email, error: e instanceof Error ? e.message.slice(0, 200) : "the mail server refused the message" });
    }
  }
  if (sent.length === 0) throw new HttpError(502, "mail_failed", `The mail server refused every message: ${failed[0]?.error ?? "unknown reason"}. Nothing was recorded as sent.`);
  await db.transaction(async (tx) => {
    await tx.insert(reportSends).values({ reportId: id, sentBy: actor.userId, recipients: sent, message: message ?? "" });
    await recordActivity(tx, {
      workspaceId: actor.workspaceId,
      projectId: row.projectId,
      actorId: actor.userId,
      action: "report.sent",
      summary: `sent ${label(row)} to ${c.supplier.name} (${sent.map((s) => s.email).join(", ")})`,
      data: { reportId: id },
    });
  });
  return { report: await getReport(db, actor, id, baseURL), sent, failed };
}

export async function acknowledgeReport(db: Database, actor: Actor, id: string, comment: string | undefined, baseURL: string) {
  const row = await visibleRow(db, actor, id);
  if (row.acknowledgedAt) throw conflict(`${reportCode(row.number)} revision ${row.revision} is already acknowledged.`, "already_acknowledged");
  const c = row.content as unknown as ReportContent;
  await db.transaction(async (tx) => {
    const changed = await tx
      .update(reports)
      .set({ acknowledgedAt: new Date(), acknowledgedBy: actor.userId })
      .where(and(eq(reports.id, id), eq(reports.status, "released"), sql`${reports.acknowledgedAt} is null`))
      .returning({ id: reports.id });
    if (!changed.length) throw conflict("The report was acknowledged meanwhile.", "already_acknowledged");
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
      summary: `of ${c.supplier.name} acknowledged ${label(row)}${comment ? `: “${comment.slice(0, 140)}”` : ""}`,
      data: { reportId: id },
    });
  });
  return getReport(db, actor, id, baseURL);
}

/** A supplier asks a question; staff answer or discuss. Both land on the report and in the activity. */
export async function addReportComment(db: Database, actor: Actor, id: string, body: string) {
  const row = await visibleRow(db, actor, id);
  const question = actor.role === "supplier";
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
      summary: `${question ? "asked a question on" : "commented on"} ${label(row)}: “${body.slice(0, 140)}”`,
      data: { reportId: id },
    });
  });
  const all = await listComments(db, "report", id);
  const releasedAt = row.releasedAt?.getTime() ?? Infinity;
  return question ? all.filter((c) => c.kind !== "released" && Date.parse(c.createdAt) >= releasedAt) : all;
}

// ---- what a project offers to build from ---------------------------------------------------

export async function reportOptions(db: Database, actor: Actor, projectId: string): Promise<ReportOptions> {
  const [p] = await db.select({ id: projects.id }).from(projects).where(and(eq(projects.workspaceId, actor.workspaceId), eq(projects.id, projectId)));
  found(p, "The project");
  const rows = await db
    .select({
      id: studies.id,
      number: studies.number,
      label: studies.label,
      status: studies.status,
      stack: studies.stack,
      finishedAt: studies.finishedAt,
      revisionId: stackRevisions.id,
      revisionNumber: stackRevisions.number,
      revisionStatus: stackRevisions.status,
      revisionStack: stackRevisions.stack,
      hasResult: sql<boolean>`${studyResults.studyId} is not null`,
      passes: studyResults.passes,
    })
    .from(studies)
    .innerJoin(stackRevisions, eq(stackRevisions.id, studies.revisionId))
    .leftJoin(studyResults, eq(studyResults.studyId, studies.id))
    .where(and(eq(studies.workspaceId, actor.workspaceId), eq(studies.projectId, projectId)))
    .orderBy(desc(studies.number));
  const supplierRows = await db.select().from(suppliers).where(eq(suppliers.workspaceId, actor.workspaceId)).orderBy(asc(suppliers.name));
  const contactCounts = await db
    .select({ supplierId: supplierContacts.supplierId, n: sql<number>`count(*)::int` })
    .from(supplierContacts)
    .innerJoin(suppliers, eq(suppliers.id, supplierContacts.supplierId))
    .where(eq(suppliers.workspaceId, actor.workspaceId))
    .groupBy(supplierContacts.supplierId);
  const latest = await db
    .selectDistinctOn([reports.supplierId], { supplierId: reports.supplierId, id: reports.id, number: reports.number, revision: reports.revision, status: reports.status })
    .from(reports)
    .where(and(eq(reports.workspaceId, actor.workspaceId), eq(reports.projectId, projectId)))
    .orderBy(reports.supplierId, desc(reports.revision));
  return {
    studies: rows.map((s) => {
      const sources = toleranceSources(s.stack as StackFile);
      const bySupplier = new Map<string, string[]>();
      const unmatched = new Map<string, string[]>();
      const unowned: string[] = [];
      for (const src of sources) {
        const m = matchOwner(src.owner, supplierRows);
        if (m) bySupplier.set(m.id, [...(bySupplier.get(m.id) ?? []), src.id]);
        else if (src.owner) unmatched.set(src.owner, [...(unmatched.get(src.owner) ?? []), src.id]);
        else unowned.push(src.id);
      }
      return {
        id: s.id,
        number: s.number,
        label: s.label,
        status: s.status,
        revisionId: s.revisionId,
        revisionNumber: s.revisionNumber,
        revisionStatus: s.revisionStatus,
        finishedAt: iso(s.finishedAt),
        passes: s.passes,
        blockedBy: reportBlocker(
          { status: s.status, number: s.number, stack: s.stack as unknown as Record<string, unknown>, result: s.hasResult ? {} : null },
          { number: s.revisionNumber, status: s.revisionStatus, stack: s.revisionStack },
        ),
        suppliers: supplierRows
          .filter((x) => bySupplier.has(x.id))
          .map((x) => {
            const l = latest.find((r) => r.supplierId === x.id);
            return {
              supplierId: x.id,
              name: x.name,
              kind: x.kind,
              sources: bySupplier.get(x.id)!,
              contacts: contactCounts.find((cc) => cc.supplierId === x.id)?.n ?? 0,
              latest: l ? { id: l.id, code: reportCode(l.number), revision: l.revision, status: l.status } : null,
            };
          }),
        unmatchedOwners: [...unmatched.entries()].map(([owner, ids]) => ({ owner, sources: ids })),
        unowned,
      };
    }),
  };
}
