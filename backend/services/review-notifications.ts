/**
 * When each notification goes out and to whom (issue 11 "who must act"): one place that reads
 * the record after the act and calls `notify`. Routes call these after the change is stored.
 */
import { eq } from "drizzle-orm";
import type { ReportContent } from "@shared/schemas/reports";
import type { Database } from "../db/client";
import type { AppDeps } from "../deps";
import { projects, reports, stackRevisions } from "../db/schema";
import type { Actor } from "../middleware/session";
import { notify, reviewersToTell } from "./notifications";
import { reportCode } from "@shared/reports/format";

/** What a notification needs: the database, the public address for links, the mail. */
export type NotifyDeps = Pick<AppDeps, "db" | "baseURL" | "mail">;

async function revisionWithProject(db: Database, id: string) {
  const [row] = await db
    .select({ rev: stackRevisions, projectName: projects.name })
    .from(stackRevisions)
    .innerJoin(projects, eq(projects.id, stackRevisions.projectId))
    .where(eq(stackRevisions.id, id));
  return row;
}

/** Submitted: the reviewers are told (the admins when there is none). Sent back or approved: its author (and who submitted it). */
export async function notifyRevision(deps: NotifyDeps, actor: Actor, id: string, kind: "submit" | "approve" | "return", comment?: string) {
  const { db } = deps;
  const row = await revisionWithProject(db, id);
  if (!row) return;
  const { rev, projectName } = row;
  const link = `/projects/${rev.projectId}/revisions/${rev.id}`;
  const base = { workspaceId: rev.workspaceId, projectId: rev.projectId, link };
  if (kind === "submit") {
    const reviewers = await reviewersToTell(db, rev.workspaceId, actor.userId);
    await notify(deps, reviewers, actor, {
      ...base,
      kind: "revision.submitted",
      title: `Revision ${rev.number} of “${projectName}” waits for your review`,
      detail: rev.note ? `${actor.name} submitted it: “${rev.note}”` : `${actor.name} submitted it.`,
    });
  } else {
    await notify(deps, [rev.createdBy, rev.submittedBy], actor, {
      ...base,
      kind: kind === "approve" ? "revision.approved" : "revision.returned",
      title:
        kind === "approve"
          ? `Revision ${rev.number} of “${projectName}” was approved`
          : `Revision ${rev.number} of “${projectName}” was sent back`,
      detail: comment ? `${actor.name}: “${comment}”` : undefined,
    });
  }
}

export type ReportEvent = "ready" | "changed" | "returned" | "released" | "sent" | "question" | "acknowledged" | "measurements";

/**
 * A report draft built, or changed after it was sent back: the reviewers (to release it; the
 * admins when there is none).
 * Everything after: the report's engineer (who built it). The supplier's contacts get the
 * report mail itself, as before.
 */
export async function notifyReport(deps: NotifyDeps, actor: Actor, id: string, event: ReportEvent, text?: string) {
  const { db } = deps;
  const [row] = await db.select().from(reports).where(eq(reports.id, id));
  if (!row) return;
  const c: Partial<ReportContent> = row.content;
  const supplier = c.supplier?.name ?? "the supplier";
  const name = `${reportCode(row.number)} revision ${row.revision}`;
  const base = { workspaceId: row.workspaceId, projectId: row.projectId, link: `/reports/${row.id}` };
  const quote = text ? `${actor.name}: “${text}”` : undefined;
  if (event === "ready" || event === "changed") {
    const reviewers = await reviewersToTell(db, row.workspaceId, actor.userId);
    await notify(deps, reviewers, actor, {
      ...base,
      kind: "report.ready",
      title: `${name} for ${supplier} waits for release`,
      detail: event === "ready" ? `${actor.name} built it.` : `${actor.name} changed it after it was sent back.`,
    });
    return;
  }
  const titles: Record<Exclude<ReportEvent, "ready" | "changed">, string> = {
    returned: `${name} for ${supplier} was sent back`,
    released: `${name} for ${supplier} was released`,
    sent: `${name} was sent to ${supplier}`,
    question: `${supplier} asked a question on ${name}`,
    acknowledged: `${supplier} acknowledged ${name}`,
    measurements: `${supplier} sent measurements for ${name}`,
  };
  await notify(deps, [row.createdBy], actor, { ...base, kind: `report.${event}`, title: titles[event], detail: quote });
}
