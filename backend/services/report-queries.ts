/**
 * Reading supplier tolerance reports: what an actor may see (staff their workspace's, a
 * supplier only its company's released ones), the list, one report with its record, and what
 * a project offers to build a report from.
 */
import { and, asc, desc, eq, sql } from "drizzle-orm";
import { alias } from "drizzle-orm/pg-core";
import { matchOwner, toleranceSources } from "@shared/reports/sources";
import type { Report, ReportOptions, ReportSummary } from "@shared/schemas/reports";
import type { StackFile } from "@shared/schemas/stack-file";
import type { Database } from "../db/client";
import {
  projects,
  reportDownloads,
  reportFiles,
  reports,
  reportSends,
  stackRevisions,
  studies,
  studyResults,
  supplierContacts,
  suppliers,
  users,
} from "../db/schema";
import { found, notFound } from "../lib/errors";
import type { Actor } from "../middleware/session";
import { reportBlocker } from "./report-content";
import { listComments } from "./revisions";
import { metricLabel } from "@shared/metrics";
import { reportCode } from "@shared/reports/format";

const creator = alias(users, "report_creator");
const releaser = alias(users, "report_releaser");
const acker = alias(users, "report_acker");

export const iso = (d: Date | null) => (d ? d.toISOString() : null);
export const reportLink = (baseURL: string, id: string) => `${baseURL.replace(/\/$/, "")}/reports/${id}`;
/** How the activity log names a report revision. */
export const reportLabel = (r: { number: number; revision: number }) => `report ${reportCode(r.number)} revision ${r.revision}`;

export type ReportRow = typeof reports.$inferSelect;

/** The report if this actor may see it: staff see their workspace's, suppliers only their company's released ones. */
export async function visibleRow(db: Database, actor: Actor, id: string): Promise<ReportRow> {
  const [row] = await db
    .select()
    .from(reports)
    .where(and(eq(reports.workspaceId, actor.workspaceId), eq(reports.id, id)));
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
  const c = r.row.content;
  return {
    id: r.row.id,
    code: reportCode(r.row.number),
    number: r.row.number,
    revision: r.row.revision,
    status: r.row.status,
    version: r.row.version,
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

export async function listReports(
  db: Database,
  actor: Actor,
  query: { projectId?: string; supplierId?: string; status?: "draft" | "released" },
) {
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
      .select({
        kind: reportFiles.kind,
        fileName: reportFiles.fileName,
        size: reportFiles.size,
        sha256: reportFiles.sha256,
        createdAt: reportFiles.createdAt,
      })
      .from(reportFiles)
      .where(eq(reportFiles.reportId, id))
      .orderBy(asc(reportFiles.kind)),
    supplierView
      ? Promise.resolve([])
      : db
          .select({
            id: reportSends.id,
            createdAt: reportSends.createdAt,
            sentByName: users.name,
            recipients: reportSends.recipients,
            message: reportSends.message,
            attachments: reportSends.attachments,
          })
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
      .select({
        id: reports.id,
        revision: reports.revision,
        status: reports.status,
        createdAt: reports.createdAt,
        releasedAt: reports.releasedAt,
      })
      .from(reports)
      .where(
        and(
          eq(reports.workspaceId, visible.workspaceId),
          eq(reports.number, visible.number),
          supplierView ? eq(reports.status, "released") : undefined,
        ),
      )
      .orderBy(desc(reports.revision)),
    listComments(db, "report", id),
  ]);
  // Review notes on the draft and the release note are internal; the supplier sees the
  // conversation from the release on (its questions, the answers, its acknowledgement).
  const releasedAt = visible.releasedAt?.getTime() ?? Infinity;
  const shownComments = supplierView
    ? commentList.filter((c) => c.kind !== "released" && Date.parse(c.createdAt) >= releasedAt)
    : commentList;
  return {
    ...toSummary(r),
    capability: visible.capability,
    note: visible.note,
    hasSnapshot: visible.snapshotPng !== null,
    content: visible.content,
    files: files.map((f) => ({ ...f, createdAt: f.createdAt.toISOString() })),
    sends: sends.map((s) => ({
      id: s.id,
      sentAt: s.createdAt.toISOString(),
      sentByName: s.sentByName,
      recipients: s.recipients,
      message: s.message,
      attachments: s.attachments,
    })),
    downloads: downloads.map((d) => ({ at: d.createdAt.toISOString(), userName: d.userName, role: d.role, kind: d.kind })),
    comments: shownComments,
    history: history.map((h) => ({
      id: h.id,
      revision: h.revision,
      status: h.status,
      createdAt: h.createdAt.toISOString(),
      releasedAt: iso(h.releasedAt),
    })),
    link: reportLink(baseURL, id),
  };
}

// ---- what a project offers to build from ---------------------------------------------------

export async function reportOptions(db: Database, actor: Actor, projectId: string): Promise<ReportOptions> {
  const [p] = await db
    .select({ id: projects.id })
    .from(projects)
    .where(and(eq(projects.workspaceId, actor.workspaceId), eq(projects.id, projectId)));
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
      missed: sql<Array<{
        metric: string;
        yield: number;
        predictedYield: number;
      }> | null>`(select jsonb_agg(jsonb_build_object('metric', r->>'metric', 'yield', (r->>'yield')::float8, 'predictedYield', (r->>'predictedYield')::float8)) from jsonb_array_elements(${studyResults.result}->'requirements') r where (r->>'passes')::boolean = false)`,
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
    .selectDistinctOn([reports.supplierId], {
      supplierId: reports.supplierId,
      id: reports.id,
      number: reports.number,
      revision: reports.revision,
      status: reports.status,
    })
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
        missed: (s.missed ?? []).map((m) => ({ ...m, label: metricLabel(m.metric) })),
        blockedBy: reportBlocker(
          { status: s.status, number: s.number, stack: s.stack, result: s.hasResult ? {} : null },
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
