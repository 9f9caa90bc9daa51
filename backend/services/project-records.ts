/**
 * Records a project keeps: an approved stack revision, a released report and a supplier's
 * acknowledgement are the evidence of a decision and are never deleted by accident. A project
 * holding any of them can be archived (read-only, hidden from the default list); only an admin
 * deletes it, by typing its name, and the deletion stays in the workspace's activity.
 */
import { and, eq, isNotNull, sql } from "drizzle-orm";
import type { Database } from "../db/client";
import { projects, reports, stackRevisions } from "../db/schema";
import { badRequest, conflict, found } from "../lib/errors";
import { deleteVersioned, requireVersion, writeVersioned } from "../lib/versions";
import type { Actor } from "../middleware/session";
import { recordActivity } from "./activity";

export type KeptRecords = { approvedRevisions: number; releasedReports: number; acknowledgements: number };

export async function keptRecords(db: Database, projectId: string): Promise<KeptRecords> {
  const [rev] = await db
    .select({ n: sql<number>`count(*)::int` })
    .from(stackRevisions)
    .where(and(eq(stackRevisions.projectId, projectId), eq(stackRevisions.status, "approved")));
  const [rep] = await db
    .select({ released: sql<number>`count(*)::int`, acknowledged: sql<number>`count(${reports.acknowledgedAt})::int` })
    .from(reports)
    .where(and(eq(reports.projectId, projectId), eq(reports.status, "released")));
  return { approvedRevisions: rev.n, releasedReports: rep.released, acknowledgements: rep.acknowledged };
}

const plural = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;

export function describeKept(k: KeptRecords): string {
  const parts = [
    k.approvedRevisions ? plural(k.approvedRevisions, "approved revision", "approved revisions") : "",
    k.releasedReports ? plural(k.releasedReports, "released report", "released reports") : "",
    k.acknowledgements ? plural(k.acknowledgements, "acknowledgement", "acknowledgements") : "",
  ].filter(Boolean);
  return parts.length > 1 ? `${parts.slice(0, -1).join(", ")} and ${parts.at(-1)}` : (parts[0] ?? "nothing kept");
}

const holdsAny = (k: KeptRecords) => k.approvedRevisions + k.releasedReports + k.acknowledgements > 0;

async function projectRow(db: Database, workspaceId: string, id: string) {
  const [p] = await db
    .select()
    .from(projects)
    .where(and(eq(projects.workspaceId, workspaceId), eq(projects.id, id)));
  return found(p, "The project");
}

/** Refuses a change to an archived project (409), so its record stays as it was archived. */
export async function assertProjectOpen(db: Database, workspaceId: string, projectId: string) {
  const [p] = await db
    .select({ name: projects.name })
    .from(projects)
    .where(and(eq(projects.workspaceId, workspaceId), eq(projects.id, projectId), isNotNull(projects.archivedAt)));
  if (p) throw conflict(`The project “${p.name}” is archived and read-only. Restore it to change it.`, "project_archived");
}

/**
 * Deletes a project, on the version the caller last read (`sent`: none is a 428, a stale one a
 * 409). One that holds kept records answers 409 to everyone but an admin, and an admin must
 * confirm with the project's exact name; the workspace's activity says what went.
 */
export async function deleteProjectGuarded(
  db: Database,
  actor: Actor,
  id: string,
  confirm: string | undefined,
  sent: number | undefined,
): Promise<void> {
  const project = await projectRow(db, actor.workspaceId, id);
  const what = `The project “${project.name}”`;
  const expected = requireVersion(what, project.version, sent);
  const kept = await keptRecords(db, id);
  const holds = holdsAny(kept);
  if (holds && actor.role !== "admin") {
    throw conflict(
      `“${project.name}” holds ${describeKept(kept)}, which are kept. Archive the project instead; only an admin can delete it.`,
      "records_kept",
    );
  }
  if (holds && confirm === undefined) {
    throw conflict(
      `“${project.name}” holds ${describeKept(kept)}. To delete them with it, confirm with the project's name.`,
      "confirmation_required",
    );
  }
  if (holds && confirm !== project.name) {
    throw badRequest("The confirmation does not match the project's name.", [
      { path: "confirm", message: `type the project's name exactly: ${project.name}` },
    ]);
  }
  await db.transaction(async (tx) => {
    await deleteVersioned(tx, projects, id, expected, what, { where: eq(projects.workspaceId, actor.workspaceId) });
    await recordActivity(tx, {
      workspaceId: actor.workspaceId,
      actorId: actor.userId,
      action: "project.deleted",
      summary: holds
        ? `deleted the project “${project.name}” with ${describeKept(kept)}, confirmed by its name`
        : `deleted the project “${project.name}”`,
      data: { projectId: id, ...(holds ? { kept } : {}) },
    });
  });
}

/** Archives (read-only, out of the default list) or restores a project, on the version the caller last read (`sent`). */
export async function setArchived(db: Database, actor: Actor, id: string, archived: boolean, sent: number | undefined): Promise<void> {
  const project = await projectRow(db, actor.workspaceId, id);
  const expected = requireVersion(`The project “${project.name}”`, project.version, sent);
  if (archived === (project.archivedAt !== null)) {
    throw conflict(`“${project.name}” is ${archived ? "already archived" : "not archived"}.`, "invalid_state");
  }
  await db.transaction(async (tx) => {
    await writeVersioned(tx, projects, id, expected, `The project “${project.name}”`, { archivedAt: archived ? new Date() : null });
    await recordActivity(tx, {
      workspaceId: actor.workspaceId,
      projectId: id,
      actorId: actor.userId,
      action: archived ? "project.archived" : "project.restored",
      summary: `${archived ? "archived" : "restored"} the project “${project.name}”`,
    });
  });
}
