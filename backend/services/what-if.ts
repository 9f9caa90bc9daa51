/**
 * What-if runs (issue 12): queue a sweep or an allocation on a revision, read it back, and make
 * a draft revision from an allocation's verified proposal.
 */
import { and, eq, inArray, sql } from "drizzle-orm";
import type { Actor } from "../middleware/session";
import type { Database } from "../db/client";
import { stackRevisions, whatIfRuns } from "../db/schema";
import { badRequest, conflict, found, type FieldError } from "../lib/errors";
import { recordActivity } from "./activity";
import { assertProjectOpen } from "./project-records";
import { getRevision, getRevisionRow } from "./revisions";
import type { WhatIfScheduler } from "./what-if-queue";
import { allocationResultOf, sweepInputOf, sweepResultOf } from "./what-if-runs";
import { validateStudy, type StudyFile } from "@shared/schemas/study-file";
import type { StackFile } from "@shared/schemas/stack-file";
import type { Allocation, CreateAllocation, CreateSweep, Sweep, WhatIfInput, WhatIfKind } from "@shared/schemas/what-if";
import { stackSources } from "@shared/datasets/sources";
import { describeParameter, withTolerances } from "@shared/whatif/parameters";
import { crossings, sweepValues, type SweepPoint } from "@shared/whatif/sweep";
import { DEFAULT_BOUND_FACTORS } from "@shared/whatif/allocation";
import { formatCount, formatNumberUnit } from "@shared/format";

/** Rounds an allocation may take (the current stack's run comes first): the progress total. */
const ALLOCATION_ROUNDS = 6;

type Revision = Awaited<ReturnType<typeof getRevisionRow>>;

/** The study file as an ordinary study would freeze it: the revision's requirements when it names none. */
function checkedStudy(revision: Revision, body: Record<string, unknown>): StudyFile {
  const file: Record<string, unknown> = { ...body };
  delete file.site;
  if (file.requirements === undefined && revision.requirements.length) file.requirements = revision.requirements;
  const v = validateStudy(file, revision.stack);
  if (!v.ok) {
    throw badRequest(
      `The study file has ${v.issues.length === 1 ? "a problem" : `${v.issues.length} problems`}; nothing was queued.`,
      v.issues.map((i) => ({ path: i.path ? `study.${i.path}` : "study", message: i.message })),
      "invalid_study",
    );
  }
  if (!v.study.requirements?.length)
    throw badRequest("A what-if run needs requirements to measure against.", [
      { path: "study.requirements", message: "give at least one requirement (or set them on the revision)" },
    ]);
  return v.study;
}

async function queueRun(
  db: Database,
  actor: Actor,
  revision: Revision,
  kind: WhatIfKind,
  input: WhatIfInput,
  total: number,
  summary: string,
) {
  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(whatIfRuns)
      .values({
        workspaceId: actor.workspaceId,
        projectId: revision.projectId,
        revisionId: revision.id,
        kind,
        input,
        stack: revision.stack,
        progressTotal: total,
        createdBy: actor.userId,
      })
      .returning({ id: whatIfRuns.id });
    await recordActivity(tx, {
      workspaceId: actor.workspaceId,
      projectId: revision.projectId,
      actorId: actor.userId,
      action: `whatif.${kind}.queued`,
      summary,
      data: { runId: row.id, revisionId: revision.id },
    });
    return row.id;
  });
}

export async function createSweep(db: Database, queue: WhatIfScheduler, actor: Actor, revisionId: string, input: CreateSweep) {
  const revision = await getRevisionRow(db, actor.workspaceId, revisionId);
  await assertProjectOpen(db, actor.workspaceId, revision.projectId);
  const study = checkedStudy(revision, input.study);
  const info = describeParameter(revision.stack, study, input.parameter);
  if ("error" in info) throw badRequest("The sweep parameter cannot be swept.", [{ path: "parameter", message: info.error }]);
  const positive = info.kind !== "inclination";
  const fields: FieldError[] = input.values.flatMap((v, i) =>
    positive && !(v > 0)
      ? [{ path: `values.${i}`, message: "a tolerance must be greater than 0" }]
      : v < info.min || v > info.max
        ? [{ path: `values.${i}`, message: `must be between ${info.min} and ${info.max}` }]
        : [],
  );
  if (fields.length) throw badRequest("A sweep value is out of range.", fields);
  const values = sweepValues(input.values);
  const id = await queueRun(
    db,
    actor,
    revision,
    "sweep",
    { study, parameter: input.parameter, values },
    values.length * study.trials,
    `queued a sweep of ${input.parameter} over ${values.length} values on stack revision ${revision.number} (${formatCount(study.trials)} trials each, seed ${study.seed})`,
  );
  queue.kick();
  return { id };
}

export async function createAllocation(db: Database, queue: WhatIfScheduler, actor: Actor, revisionId: string, input: CreateAllocation) {
  const revision = await getRevisionRow(db, actor.workspaceId, revisionId);
  await assertProjectOpen(db, actor.workspaceId, revision.projectId);
  const study = checkedStudy(revision, input.study);
  const sources = new Map(
    stackSources(revision.stack)
      .filter((s) => s.tolerance.dist !== "data" && (s.tolerance.tol ?? 0) > 0)
      .map((s) => [s.id, s.tolerance.tol!]),
  );
  const unknown = (id: string) => `the stack has no tolerance source "${id}" with a ± half-width`;
  const fields: FieldError[] = [
    ...(input.free ?? []).flatMap((id, i) => (sources.has(id) ? [] : [{ path: `free.${i}`, message: unknown(id) }])),
    ...Object.keys(input.costs ?? {}).flatMap((id) => (sources.has(id) ? [] : [{ path: `costs.${id}`, message: unknown(id) }])),
    ...Object.entries(input.bounds ?? {}).flatMap(([id, b]) => {
      const T = sources.get(id);
      if (T === undefined) return [{ path: `bounds.${id}`, message: unknown(id) }];
      const min = b.min ?? T * DEFAULT_BOUND_FACTORS.min,
        max = b.max ?? T * DEFAULT_BOUND_FACTORS.max;
      return min < max ? [] : [{ path: `bounds.${id}`, message: `min (${min}) must be below max (${max})` }];
    }),
  ];
  if (fields.length) throw badRequest("The allocation names something the stack does not have.", fields);
  const id = await queueRun(
    db,
    actor,
    revision,
    "allocation",
    { study, free: input.free, costs: input.costs, bounds: input.bounds },
    (ALLOCATION_ROUNDS + 1) * study.trials,
    `queued a tolerance allocation on stack revision ${revision.number} (${input.free ? `${input.free.length} free sources` : "every source free"}, ${formatCount(study.trials)} trials per verifying run, seed ${study.seed})`,
  );
  queue.kick();
  return { id };
}

async function runRow(db: Database, workspaceId: string, id: string, kind: "sweep" | "allocation") {
  const [row] = await db
    .select({ run: whatIfRuns, revisionNumber: stackRevisions.number })
    .from(whatIfRuns)
    .innerJoin(stackRevisions, eq(stackRevisions.id, whatIfRuns.revisionId))
    .where(and(eq(whatIfRuns.workspaceId, workspaceId), eq(whatIfRuns.id, id), eq(whatIfRuns.kind, kind)));
  return found(row, kind === "sweep" ? "The sweep" : "The allocation");
}

function base(row: Awaited<ReturnType<typeof runRow>>) {
  const r = row.run;
  const study = r.input.study;
  return {
    id: r.id,
    projectId: r.projectId,
    revisionId: r.revisionId,
    revisionNumber: row.revisionNumber,
    status: r.status,
    progress: { done: r.progressDone, total: r.progressTotal },
    error: r.error,
    trials: study.trials,
    seed: study.seed,
    createdAt: r.createdAt.toISOString(),
    finishedAt: r.finishedAt ? r.finishedAt.toISOString() : null,
  };
}

export async function getSweep(db: Database, workspaceId: string, id: string): Promise<Sweep> {
  const row = await runRow(db, workspaceId, id, "sweep");
  const input = sweepInputOf(row.run.input);
  const info = describeParameter(row.run.stack, input.study, input.parameter);
  const points = (sweepResultOf(row.run.result)?.points ?? []).map((p) => ({
    value: p.value,
    requirements: p.requirements.map((r) => ({ ...r, limitAtTarget: Number.isFinite(r.limitAtTarget) ? r.limitAtTarget : null })),
  }));
  return {
    ...base(row),
    parameter: input.parameter,
    parameterKind: "error" in info ? "source" : info.kind,
    unit: "error" in info ? "um" : info.unit,
    current: "error" in info ? NaN : info.current,
    values: input.values,
    points,
    // from the points so far: a running sweep shows the crossings it has already passed
    crossings: crossings(points as SweepPoint[]),
  };
}

export async function getAllocation(db: Database, workspaceId: string, id: string): Promise<Allocation> {
  const row = await runRow(db, workspaceId, id, "allocation");
  const out = allocationResultOf(row.run.result);
  const num = (v: number | null | undefined) => (typeof v === "number" && Number.isFinite(v) ? v : null);
  return {
    ...base(row),
    verified: out ? out.verified : null,
    message: out?.message ?? null,
    method: out?.method ?? null,
    sources: out?.sources ?? [],
    requirements: (out?.requirements ?? []).map((r) => ({
      ...r,
      limitAtTarget: num(r.limitAtTarget),
      current: { ...r.current, limitAtTarget: num(r.current.limitAtTarget) },
    })),
    totalCostCurrent: num(out?.totalCostCurrent),
    totalCostProposed: num(out?.totalCostProposed),
    rounds: (out?.rounds ?? []).map((r) => ({ ...r, closestShare: num(r.closestShare) ?? 0, minLowerMargin: num(r.minLowerMargin) ?? 0 })),
    appliedRevisionId: row.run.appliedRevisionId,
  };
}

/**
 * Cancels a queued or running sweep or allocation: the state and its activity record in one
 * transaction; then a run this process is running stops at once, and one running anywhere else
 * (a server-mode worker) stops at its next progress write, which finds the state changed.
 */
export async function cancelRun(db: Database, queue: WhatIfScheduler, actor: Actor, id: string, kind: "sweep" | "allocation") {
  const row = await runRow(db, actor.workspaceId, id, kind);
  await assertProjectOpen(db, actor.workspaceId, row.run.projectId);
  const what = kind === "sweep" ? "sweep" : "allocation";
  await db.transaction(async (tx) => {
    const rows = await tx
      .update(whatIfRuns)
      .set({ status: "cancelled", finishedAt: new Date(), error: null })
      .where(and(eq(whatIfRuns.id, id), inArray(whatIfRuns.status, ["queued", "running"])))
      .returning({ id: whatIfRuns.id });
    if (!rows.length) {
      const [now] = await tx.select({ status: whatIfRuns.status }).from(whatIfRuns).where(eq(whatIfRuns.id, id));
      throw conflict(`The ${what} is ${now?.status ?? row.run.status}; only a queued or running one can be cancelled.`, "invalid_state");
    }
    await recordActivity(tx, {
      workspaceId: actor.workspaceId,
      projectId: row.run.projectId,
      actorId: actor.userId,
      action: `whatif.${kind}.cancelled`,
      summary: `cancelled a ${what} on stack revision ${row.revisionNumber}`,
      data: { runId: id, revisionId: row.run.revisionId },
    });
  });
  await queue.cancel(id);
}

/** A new draft revision with the proposal's tolerances (the run's frozen stack, the revision's requirements). */
export async function applyAllocation(db: Database, actor: Actor, id: string) {
  const row = await runRow(db, actor.workspaceId, id, "allocation");
  const run = row.run;
  if (run.status !== "finished") throw conflict(`The allocation is ${run.status}; only a finished one can be applied.`, "invalid_state");
  if (run.appliedRevisionId) throw conflict("A draft was already made from this allocation.", "already_applied");
  const out = allocationResultOf(run.result);
  if (!out?.verified)
    throw conflict("This proposal was not verified by Monte Carlo; change the bounds or costs and run it again.", "not_verified");
  const revision = await getRevisionRow(db, actor.workspaceId, run.revisionId);
  await assertProjectOpen(db, actor.workspaceId, run.projectId);
  const changed = out.sources.filter((s) => s.proposed !== s.current);
  const stack = withTolerances(run.stack as StackFile, Object.fromEntries(changed.map((s) => [s.source, s.proposed])));
  const changes = changed.map((s) => `${s.source} ±${formatNumberUnit(s.current, s.unit)} → ±${formatNumberUnit(s.proposed, s.unit)}`);
  const note =
    `Tolerances proposed by the least-cost allocation on revision ${row.revisionNumber}, verified by Monte Carlo ` +
    `(${formatCount(out.trials)} trials, seed ${out.seed}): ${changes.length ? changes.join("; ") : "no change"}.`;
  const newId = await db.transaction(async (tx) => {
    const [{ next }] = await tx
      .select({ next: sql<number>`coalesce(max(${stackRevisions.number}), 0)::int + 1` })
      .from(stackRevisions)
      .where(eq(stackRevisions.projectId, run.projectId));
    const [rev] = await tx
      .insert(stackRevisions)
      .values({
        workspaceId: actor.workspaceId,
        projectId: run.projectId,
        number: next,
        stack,
        requirements: revision.requirements,
        note,
        basedOnId: revision.id,
        createdBy: actor.userId,
      })
      .returning({ id: stackRevisions.id });
    const claimed = await tx
      .update(whatIfRuns)
      .set({ appliedRevisionId: rev.id })
      .where(and(eq(whatIfRuns.id, run.id), sql`${whatIfRuns.appliedRevisionId} is null`))
      .returning({ id: whatIfRuns.id });
    if (!claimed.length) throw conflict("A draft was already made from this allocation.", "already_applied");
    await recordActivity(tx, {
      workspaceId: actor.workspaceId,
      projectId: run.projectId,
      actorId: actor.userId,
      action: "revision.created",
      summary: `started stack revision ${next} from a tolerance allocation on revision ${row.revisionNumber} (${changed.length} tolerances changed)`,
      data: { revisionId: rev.id, runId: run.id },
    });
    return rev.id;
  });
  return getRevision(db, actor.workspaceId, newId);
}
