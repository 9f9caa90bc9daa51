import { and, desc, eq, inArray, sql } from "drizzle-orm";
import type { CreateStudy, Study, StudySummary } from "@shared/schemas/studies";
import { validateStudy } from "@shared/schemas/study-file";
import type { Database } from "../db/client";
import { projects, stackRevisions, studies, studyResults, users } from "../db/schema";
import { badRequest, conflict, found } from "../lib/errors";
import type { Actor } from "../middleware/session";
import { recordActivity } from "./activity";
import { assertWithinBudget } from "./study-budget";
import { applyAsBuilt, asBuiltLabel } from "./as-built";
import { fieldAtSite } from "./geomagnetic";
import { assertProjectOpen } from "./project-records";
import { getRevisionRow } from "./revisions";
import type { StudyScheduler } from "./study-queue";
import { formatCount } from "@shared/format";

const summaryColumns = {
  id: studies.id,
  projectId: studies.projectId,
  revisionId: studies.revisionId,
  revisionNumber: stackRevisions.number,
  number: studies.number,
  label: studies.label,
  status: studies.status,
  study: studies.study,
  trialsDone: studies.trialsDone,
  trialsTotal: studies.trialsTotal,
  trialsPerSecond: studies.trialsPerSecond,
  error: studies.error,
  createdByName: users.name,
  createdAt: studies.createdAt,
  startedAt: studies.startedAt,
  finishedAt: studies.finishedAt,
  passes: studyResults.passes,
  asBuilt: studies.asBuilt,
};

type Row = Awaited<ReturnType<ReturnType<typeof baseQuery>["where"]>>[number];

const iso = (d: Date | null) => (d ? d.toISOString() : null);

function toSummary({ study, trialsDone, trialsTotal, trialsPerSecond, asBuilt, ...r }: Row): StudySummary {
  return {
    ...r,
    asBuilt: (asBuilt ?? []).map(({ replaced: _replaced, ...a }) => a),
    trials: study.trials,
    seed: study.seed,
    progress: { done: trialsDone, total: trialsTotal || study.trials, trialsPerSecond },
    createdAt: r.createdAt.toISOString(),
    startedAt: iso(r.startedAt),
    finishedAt: iso(r.finishedAt),
  };
}

function baseQuery(db: Database) {
  return db
    .select(summaryColumns)
    .from(studies)
    .innerJoin(stackRevisions, eq(stackRevisions.id, studies.revisionId))
    .leftJoin(users, eq(users.id, studies.createdBy))
    .leftJoin(studyResults, eq(studyResults.studyId, studies.id));
}

export async function listStudies(db: Database, workspaceId: string, projectId: string) {
  const [p] = await db
    .select({ id: projects.id })
    .from(projects)
    .where(and(eq(projects.workspaceId, workspaceId), eq(projects.id, projectId)));
  found(p, "The project");
  const rows = await baseQuery(db)
    .where(and(eq(studies.workspaceId, workspaceId), eq(studies.projectId, projectId)))
    .orderBy(desc(studies.number));
  return rows.map(toSummary);
}

export async function getStudy(db: Database, workspaceId: string, id: string, withResult = true): Promise<Study> {
  const [row] = await baseQuery(db).where(and(eq(studies.workspaceId, workspaceId), eq(studies.id, id)));
  const r = found(row, "The study");
  const [extra] = await db.select({ stack: studies.stack, site: studies.site }).from(studies).where(eq(studies.id, id));
  const [res] = withResult ? await db.select({ result: studyResults.result }).from(studyResults).where(eq(studyResults.studyId, id)) : [];
  return {
    ...toSummary(r),
    study: r.study,
    stack: extra.stack,
    site: extra.site ?? null,
    result: res?.result ?? null,
  };
}

/**
 * Freezes the study file (with the revision's requirements when it names none, and the WMM
 * inclination when a site is given) and the revision's stack, then queues it.
 */
export async function createStudy(db: Database, queue: StudyScheduler, actor: Actor, revisionId: string, input: CreateStudy) {
  const revision = await getRevisionRow(db, actor.workspaceId, revisionId);
  await assertProjectOpen(db, actor.workspaceId, revision.projectId);
  const file: Record<string, unknown> = { ...input.study };
  delete file.site;
  let site: Study["site"] = null;
  if (input.site) {
    site = fieldAtSite(input.site);
    file.inclinationDeg = Math.round(site.inclinationDeg * 1e4) / 1e4;
  }
  if (file.requirements === undefined && revision.requirements.length) file.requirements = revision.requirements;
  // As built: measured data sets in place of chosen tolerances, in the frozen copy only.
  const asBuilt = input.asBuilt?.length ? await applyAsBuilt(db, actor.workspaceId, revision, input.asBuilt) : null;
  const stack = asBuilt?.stack ?? revision.stack;
  const v = validateStudy(file, stack);
  if (!v.ok) {
    throw badRequest(
      `The study file has ${v.issues.length === 1 ? "a problem" : `${v.issues.length} problems`}; nothing was queued.`,
      v.issues.map((i) => ({ path: i.path ? `study.${i.path}` : "study", message: i.message })),
      "invalid_study",
    );
  }
  await assertWithinBudget(db, actor.workspaceId, v.study, stack);
  const id = await db.transaction(async (tx) => {
    const [{ next }] = await tx
      .select({ next: sql<number>`coalesce(max(${studies.number}), 0)::int + 1` })
      .from(studies)
      .where(eq(studies.projectId, revision.projectId));
    const [row] = await tx
      .insert(studies)
      .values({
        workspaceId: actor.workspaceId,
        projectId: revision.projectId,
        revisionId,
        number: next,
        label: input.label || (asBuilt ? asBuiltLabel(asBuilt.records) : ""),
        study: v.study,
        stack,
        asBuilt: asBuilt ? asBuilt.records : null,
        site,
        trialsTotal: v.study.trials,
        createdBy: actor.userId,
      })
      .returning({ id: studies.id });
    await recordActivity(tx, {
      workspaceId: actor.workspaceId,
      projectId: revision.projectId,
      actorId: actor.userId,
      action: "study.queued",
      summary: `queued ${asBuilt ? "as-built " : ""}study ${next} on stack revision ${revision.number} (${formatCount(v.study.trials)} trials, seed ${v.study.seed})${
        asBuilt ? `, measured data for ${asBuilt.records.map((r) => r.source).join(", ")}` : ""
      }`,
      data: { studyId: row.id },
    });
    return row.id;
  });
  queue.kick();
  return getStudy(db, actor.workspaceId, id, false);
}

export async function cancelStudy(db: Database, queue: StudyScheduler, actor: Actor, id: string) {
  const s = await getStudy(db, actor.workspaceId, id, false);
  await assertProjectOpen(db, actor.workspaceId, s.projectId);
  if (s.status !== "queued" && s.status !== "running")
    throw conflict(`Study ${s.number} is ${s.status}; only a queued or running study can be cancelled.`, "invalid_state");
  await queue.cancel(id);
  // it may have finished (or failed) in the meantime: only a cancel that took is recorded
  const after = await getStudy(db, actor.workspaceId, id, false);
  if (after.status !== "cancelled")
    throw conflict(`Study ${s.number} is ${after.status}; it ended before the cancel reached it.`, "invalid_state");
  await recordActivity(db, {
    workspaceId: actor.workspaceId,
    projectId: s.projectId,
    actorId: actor.userId,
    action: "study.cancelled",
    summary: `cancelled study ${s.number}`,
  });
  return after;
}

const RERUNNABLE: Study["status"][] = ["interrupted", "failed", "cancelled"];

/** Puts an interrupted, failed or cancelled study back in the queue with the same frozen settings. */
export async function rerunStudy(db: Database, queue: StudyScheduler, actor: Actor, id: string) {
  const s = await getStudy(db, actor.workspaceId, id, false);
  await assertProjectOpen(db, actor.workspaceId, s.projectId);
  const notRerunnable = (status: string) =>
    conflict(`Study ${s.number} is ${status}; only an interrupted, failed or cancelled study can be run again.`, "invalid_state");
  if (!RERUNNABLE.includes(s.status)) throw notRerunnable(s.status);
  // the budget may have been lowered since it first ran
  await assertWithinBudget(db, actor.workspaceId, s.study, s.stack);
  await db.transaction(async (tx) => {
    await tx.delete(studyResults).where(eq(studyResults.studyId, id));
    // guarded by its state, so of two people running it again at once one is taken (it has no version: decision 034)
    const requeued = await tx
      .update(studies)
      .set({
        status: "queued",
        trialsDone: 0,
        trialsPerSecond: null,
        error: null,
        startedAt: null,
        finishedAt: null,
        createdAt: new Date(),
      })
      .where(and(eq(studies.id, id), inArray(studies.status, RERUNNABLE)))
      .returning({ id: studies.id });
    if (!requeued.length) throw notRerunnable("already queued again");
    await recordActivity(tx, {
      workspaceId: actor.workspaceId,
      projectId: s.projectId,
      actorId: actor.userId,
      action: "study.requeued",
      summary: `ran study ${s.number} again`,
    });
  });
  queue.kick();
  return getStudy(db, actor.workspaceId, id, false);
}
