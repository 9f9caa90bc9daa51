import { eq } from "drizzle-orm";
import type { ResultFile } from "@shared/schemas/result-file";
import type { Database } from "../db/client";
import { studies, studyResults } from "../db/schema";
import { recordActivity } from "./activity";

type Tx = Parameters<Parameters<Database["transaction"]>[0]>[0];

export type FinishingStudy = { id: string; workspaceId: string; projectId: string; number: number };

/**
 * Writes a study's result, its finished state and the activity record: called inside the one
 * transaction that ends a study, so they land together or not at all (in-process queue and
 * server-mode jobs alike).
 */
export async function writeFinishedStudy(
  tx: Tx,
  job: FinishingStudy,
  outcome: { result: ResultFile; passes: boolean | null; seconds: number },
): Promise<void> {
  const { result, passes, seconds } = outcome;
  const trials = typeof result.trials === "number" ? result.trials : undefined;
  await tx.insert(studyResults).values({ studyId: job.id, result, passes });
  await tx
    .update(studies)
    .set({
      status: "finished",
      finishedAt: new Date(),
      ...(trials !== undefined ? { trialsDone: trials, trialsTotal: trials, trialsPerSecond: trials / Math.max(seconds, 1e-3) } : {}),
    })
    .where(eq(studies.id, job.id));
  await recordActivity(tx, {
    workspaceId: job.workspaceId,
    projectId: job.projectId,
    action: "study.finished",
    summary: `study ${job.number} finished${passes === null ? "" : passes ? ": every requirement met" : ": a requirement is not met"}`,
    data: { studyId: job.id },
  });
}
