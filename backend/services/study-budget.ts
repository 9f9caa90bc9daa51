/**
 * The work budget of studies (issue 10, item 10): one study may ask at most this many
 * trial-attitudes of the engine, so that one huge study cannot hold every other one in the
 * queue for hours. An admin sets it per workspace; the study settings form shows the time a
 * study would take at the pace this server has shown on the workspace's recent studies.
 */
import { and, desc, eq, isNotNull } from "drizzle-orm";
import { formatCount } from "@shared/format";
import { DEFAULT_STUDY_WORK_BUDGET, MAX_STUDY_WORK_BUDGET, type StudyBudget } from "@shared/schemas/studies";
import { studyWork, type StudyFile } from "@shared/schemas/study-file";
import type { StackFile } from "@shared/schemas/stack-file";
import type { Database } from "../db/client";
import { studies, workspaces } from "../db/schema";
import { badRequest } from "../lib/errors";
import type { Actor } from "../middleware/session";
import { recordActivity } from "./activity";

/** How many recent finished studies the measured pace is the median of. */
const PACE_STUDIES = 20;

async function budgetOf(db: Database, workspaceId: string): Promise<number> {
  const [w] = await db.select({ budget: workspaces.studyWorkBudget }).from(workspaces).where(eq(workspaces.id, workspaceId));
  return w?.budget ?? DEFAULT_STUDY_WORK_BUDGET;
}

/**
 * Work per second of the workspace's last finished studies, from their own start and end times
 * (queue waits excluded): the median, so one study that shared the engine with others does not
 * set the pace alone.
 */
async function measuredPace(db: Database, workspaceId: string): Promise<{ workPerSecond: number | null; n: number }> {
  const rows = await db
    .select({ study: studies.study, trials: studies.trialsTotal, startedAt: studies.startedAt, finishedAt: studies.finishedAt })
    .from(studies)
    .where(
      and(
        eq(studies.workspaceId, workspaceId),
        eq(studies.status, "finished"),
        isNotNull(studies.startedAt),
        isNotNull(studies.finishedAt),
      ),
    )
    .orderBy(desc(studies.finishedAt))
    .limit(PACE_STUDIES);
  const rates = rows
    .map((r) => {
      const seconds = (r.finishedAt!.getTime() - r.startedAt!.getTime()) / 1000;
      const { work } = studyWork({ ...r.study, trials: r.trials || r.study.trials });
      return seconds > 0 && work > 0 ? work / seconds : NaN;
    })
    .filter((x) => Number.isFinite(x))
    .sort((a, b) => a - b);
  if (!rates.length) return { workPerSecond: null, n: 0 };
  const mid = rates.length / 2;
  return { workPerSecond: rates.length % 2 ? rates[Math.floor(mid)] : (rates[mid - 1] + rates[mid]) / 2, n: rates.length };
}

export async function getStudyBudget(db: Database, workspaceId: string): Promise<StudyBudget> {
  const [budget, pace] = await Promise.all([budgetOf(db, workspaceId), measuredPace(db, workspaceId)]);
  return {
    budget,
    defaultBudget: DEFAULT_STUDY_WORK_BUDGET,
    maxBudget: MAX_STUDY_WORK_BUDGET,
    workPerSecond: pace.workPerSecond,
    measuredStudies: pace.n,
  };
}

export async function setStudyBudget(db: Database, actor: Actor, budget: number): Promise<StudyBudget> {
  await db.transaction(async (tx) => {
    await tx.update(workspaces).set({ studyWorkBudget: budget }).where(eq(workspaces.id, actor.workspaceId));
    await recordActivity(tx, {
      workspaceId: actor.workspaceId,
      actorId: actor.userId,
      action: "workspace.study_budget",
      summary: `set the study work budget to ${formatCount(budget)} trial-attitudes`,
      data: { budget },
    });
  });
  return getStudyBudget(db, actor.workspaceId);
}

/** A 400 naming `study.trials` when the study asks for more work than the workspace's budget. */
export async function assertWithinBudget(db: Database, workspaceId: string, study: StudyFile, stack: StackFile) {
  const { attitudes, work } = studyWork(study, stack);
  const budget = await budgetOf(db, workspaceId);
  if (work <= budget) return;
  const ask =
    attitudes > 1
      ? `${formatCount(study.trials)} trials × ${formatCount(attitudes)} attitudes = ${formatCount(work)}`
      : `${formatCount(study.trials)} trials`;
  throw badRequest(
    "The study asks for more work than this workspace allows one study; nothing was queued.",
    [
      {
        path: "study.trials",
        message: `${ask} is past the work budget of ${formatCount(budget)} trial-attitudes: use fewer trials${attitudes > 1 ? ", a coarser heading step or fewer tilts" : ""}, or ask an admin to raise the budget`,
      },
    ],
    "over_budget",
  );
}
