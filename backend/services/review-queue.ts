/**
 * What waits for whom (issue 11 "who must act"): read from the records themselves, not from the
 * notifications, so it stays true when a notification was read or another reviewer acted first.
 * Archived projects are read-only and wait for nobody.
 */
import { and, eq, inArray, isNull, sql } from "drizzle-orm";
import { can } from "@shared/permissions";
import { reportCode } from "@shared/reports/format";
import type { ProjectAwaiting, ReviewQueue, WorkItem } from "@shared/schemas/review-queue";
import type { Database } from "../db/client";
import { activities, comments, projects, reports, stackRevisions, users } from "../db/schema";
import type { Actor } from "../middleware/session";

/** The latest comment of one kind on a record (a timestamp, or null). */
const lastComment = (target: "revision" | "report", id: typeof stackRevisions.id | typeof reports.id, kind: string) =>
  sql`(select max(${comments.createdAt}) from ${comments} where ${comments.targetType} = ${target} and ${comments.targetId} = ${id} and ${comments.kind} = ${kind})`;

/** A draft report sent back and not changed since: it waits for its engineer, not for release. */
const reportReturned = sql<boolean>`coalesce(${lastComment("report", reports.id, "returned")} > coalesce((select max(${activities.createdAt}) from ${activities} where ${activities.action} = 'report.updated' and ${activities.data}->>'reportId' = ${reports.id}::text), 'epoch'::timestamptz), false)`;

/** Whether a report draft was sent back and has not been changed since (it waits for its engineer). */
export async function reportSentBack(db: Database, id: string): Promise<boolean> {
  const [row] = await db
    .select({ returned: reportReturned })
    .from(reports)
    // with a join drizzle names each column with its table; alone it would leave "id" bare,
    // which the subqueries over comments and activities would read as their own
    .innerJoin(projects, eq(projects.id, reports.projectId))
    .where(and(eq(reports.id, id), eq(reports.status, "draft")));
  return row?.returned === true;
}

/** A supplier's question later than any staff comment on the report. */
const questionOpen = sql<boolean>`coalesce(${lastComment("report", reports.id, "question")} > coalesce(${lastComment("report", reports.id, "comment")}, 'epoch'::timestamptz), false)`;

const reportColumns = {
  id: reports.id,
  number: reports.number,
  revision: reports.revision,
  projectId: reports.projectId,
  projectName: projects.name,
  supplierName: sql<string | null>`${reports.content}->'supplier'->>'name'`,
  createdBy: reports.createdBy,
  createdAt: reports.createdAt,
  returnedAt: lastComment("report", reports.id, "returned").mapWith(reports.createdAt),
  askedAt: lastComment("report", reports.id, "question").mapWith(reports.createdAt),
  changedAt: reports.updatedAt,
};

const reportTitle = (r: { number: number; revision: number; supplierName: string | null }) =>
  `${reportCode(r.number)} revision ${r.revision} for ${r.supplierName ?? "a deleted supplier"}`;

/** Who did the last thing on each item: a comment's author or the record's own person. */
async function lastAuthors(db: Database, target: "revision" | "report", ids: string[], kind: string) {
  if (!ids.length) return new Map<string, string | null>();
  const rows = await db
    .selectDistinctOn([comments.targetId], { targetId: comments.targetId, authorId: comments.authorId })
    .from(comments)
    .where(and(eq(comments.targetType, target), inArray(comments.targetId, ids), eq(comments.kind, kind)))
    .orderBy(comments.targetId, sql`${comments.createdAt} desc`);
  return new Map(rows.map((r) => [r.targetId, r.authorId]));
}

export async function reviewQueue(db: Database, actor: Actor): Promise<ReviewQueue> {
  const open = and(eq(projects.workspaceId, actor.workspaceId), isNull(projects.archivedAt));
  const items: Array<Omit<WorkItem, "by"> & { byId: string | null }> = [];

  const inReview = await db
    .select({
      id: stackRevisions.id,
      number: stackRevisions.number,
      projectId: stackRevisions.projectId,
      projectName: projects.name,
      submittedAt: stackRevisions.submittedAt,
      updatedAt: stackRevisions.updatedAt,
      submittedBy: stackRevisions.submittedBy,
    })
    .from(stackRevisions)
    .innerJoin(projects, eq(projects.id, stackRevisions.projectId))
    .where(and(open, eq(stackRevisions.status, "in_review")));
  const ready = await db
    .select(reportColumns)
    .from(reports)
    .innerJoin(projects, eq(projects.id, reports.projectId))
    .where(and(open, eq(reports.status, "draft"), sql`not ${reportReturned}`));

  if (can(actor.role, "revisions.review")) {
    for (const r of inReview) {
      items.push({
        kind: "revision.review",
        title: `Revision ${r.number} of “${r.projectName}”`,
        projectId: r.projectId,
        projectName: r.projectName,
        link: `/projects/${r.projectId}/revisions/${r.id}`,
        since: (r.submittedAt ?? r.updatedAt).toISOString(),
        byId: r.submittedBy,
      });
    }
  }
  if (can(actor.role, "reports.release")) {
    for (const r of ready) {
      items.push({
        kind: "report.release",
        title: reportTitle(r),
        projectId: r.projectId,
        projectName: r.projectName,
        link: `/reports/${r.id}`,
        since: r.changedAt.toISOString(),
        byId: r.createdBy,
      });
    }
  }
  if (can(actor.role, "revisions.write")) {
    const returned = await db
      .select({
        id: stackRevisions.id,
        number: stackRevisions.number,
        projectId: stackRevisions.projectId,
        projectName: projects.name,
        returnedAt: lastComment("revision", stackRevisions.id, "returned").mapWith(stackRevisions.createdAt),
      })
      .from(stackRevisions)
      .innerJoin(projects, eq(projects.id, stackRevisions.projectId))
      .where(
        and(
          open,
          eq(stackRevisions.status, "draft"),
          eq(stackRevisions.createdBy, actor.userId),
          sql`${lastComment("revision", stackRevisions.id, "returned")} is not null`,
        ),
      );
    const by = await lastAuthors(
      db,
      "revision",
      returned.map((r) => r.id),
      "returned",
    );
    for (const r of returned) {
      items.push({
        kind: "revision.returned",
        title: `Revision ${r.number} of “${r.projectName}”`,
        projectId: r.projectId,
        projectName: r.projectName,
        link: `/projects/${r.projectId}/revisions/${r.id}`,
        since: (r.returnedAt as Date).toISOString(),
        byId: by.get(r.id) ?? null,
      });
    }
  }
  if (can(actor.role, "reports.write")) {
    const mine = and(open, eq(reports.createdBy, actor.userId));
    const returned = await db
      .select(reportColumns)
      .from(reports)
      .innerJoin(projects, eq(projects.id, reports.projectId))
      .where(and(mine, eq(reports.status, "draft"), reportReturned));
    const asked = await db
      .select(reportColumns)
      .from(reports)
      .innerJoin(projects, eq(projects.id, reports.projectId))
      .where(and(mine, eq(reports.status, "released"), questionOpen));
    const returnedBy = await lastAuthors(
      db,
      "report",
      returned.map((r) => r.id),
      "returned",
    );
    const askedBy = await lastAuthors(
      db,
      "report",
      asked.map((r) => r.id),
      "question",
    );
    for (const [kind, rows, by, at] of [
      ["report.returned", returned, returnedBy, "returnedAt"],
      ["report.question", asked, askedBy, "askedAt"],
    ] as const) {
      for (const r of rows) {
        items.push({
          kind,
          title: reportTitle(r),
          projectId: r.projectId,
          projectName: r.projectName,
          link: `/reports/${r.id}`,
          since: (r[at] as Date).toISOString(),
          byId: by.get(r.id) ?? null,
        });
      }
    }
  }

  const ids = [...new Set(items.map((i) => i.byId).filter((id): id is string => !!id))];
  const names = new Map(
    ids.length
      ? (await db.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, ids))).map((u) => [u.id, u.name])
      : [],
  );
  const awaiting = new Map<string, ProjectAwaiting>();
  const count = (projectId: string) => {
    const entry = awaiting.get(projectId) ?? { projectId, revisions: 0, reports: 0 };
    awaiting.set(projectId, entry);
    return entry;
  };
  for (const r of inReview) count(r.projectId).revisions++;
  for (const r of ready) count(r.projectId).reports++;

  return {
    // the longest waiting first
    items: items
      .map(({ byId, ...item }) => ({ ...item, by: byId ? (names.get(byId) ?? null) : null }))
      .sort((a, b) => a.since.localeCompare(b.since)),
    awaitingReview: [...awaiting.values()],
  };
}
