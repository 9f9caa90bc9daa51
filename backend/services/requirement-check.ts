/**
 * Deciding with eyes open (issue 11): does a revision meet its requirements? Each requirement is
 * judged by the newest finished design study of this revision that ran on the stack as it is now
 * (a study of an earlier state of a draft says nothing about the one submitted; an as-built study
 * judges the line, not the design), else by the editor's live estimate, run with the same
 * engine, seed and trials, so the engineer is shown the figures the editor showed. The estimate
 * runs on an engine thread (EnginePool.estimate), not on the thread that answers requests: 3,000
 * trials there held every other request up for 50-190 ms.
 */
import { isDeepStrictEqual } from "node:util";
import { and, desc, eq, isNull } from "drizzle-orm";
import { LIVE_INCLINATION_DEG, type EstimateSummary, type LiveStudy } from "@shared/engine/live-estimate";
import { liveStudy } from "@shared/engine/live-study";
import { metricLabel, metricUnit } from "@shared/metrics";
import type { RequirementResult } from "@shared/schemas/result-file";
import type { RequirementCheck, RevisionCheck } from "@shared/schemas/revisions";
import { validateStackFile, type StackFile } from "@shared/schemas/stack-file";
import type { Database } from "../db/client";
import { studies, studyResults } from "../db/schema";
import { conflict } from "../lib/errors";
import { getRevisionRow } from "./revisions";

/** Finished studies looked at for one whose stack is the revision's current one. */
const STUDIES_LOOKED_AT = 20;

type RevisionRow = Awaited<ReturnType<typeof getRevisionRow>>;

async function studyOfCurrentStack(db: Database, row: RevisionRow) {
  const rows = await db
    .select({ id: studies.id, number: studies.number, stack: studies.stack, result: studyResults.result })
    .from(studies)
    .innerJoin(studyResults, eq(studyResults.studyId, studies.id))
    .where(and(eq(studies.revisionId, row.id), eq(studies.status, "finished"), isNull(studies.asBuilt)))
    .orderBy(desc(studies.number))
    .limit(STUDIES_LOOKED_AT);
  return rows.find((s) => isDeepStrictEqual(s.stack, row.stack)) ?? null;
}

/** Where the live estimate runs (the server: its engine pool). */
export type EstimateRunner = (stack: StackFile, live: LiveStudy) => Promise<EstimateSummary>;

export async function checkRevision(db: Database, workspaceId: string, id: string, runEstimate: EstimateRunner): Promise<RevisionCheck> {
  const row = await getRevisionRow(db, workspaceId, id);
  const requirements = row.requirements;
  if (requirements.length === 0) return { requirements: [], failing: [] };

  const judged: (RequirementCheck | null)[] = requirements.map(() => null);
  const labelOf = (i: number) => {
    const r = requirements[i] as { metric: string; name?: string };
    return r.name?.trim() || metricLabel(r.metric);
  };
  const study = await studyOfCurrentStack(db, row);
  if (study) {
    const results = ((study.result as { requirements?: RequirementResult[] }).requirements ?? []) as RequirementResult[];
    requirements.forEach((r, i) => {
      // the study's yield at the same limit; the target is the revision's (it may have been raised since)
      const res = results.find((x) => x.metric === r.metric && x.max === r.max);
      if (!res) return;
      judged[i] = {
        index: i,
        metric: r.metric,
        label: labelOf(i),
        unit: metricUnit(r.metric),
        max: r.max,
        target: r.yield,
        reached: res.predictedYield,
        passes: res.predictedYield >= r.yield,
        source: { kind: "study", studyId: study.id, number: study.number },
      };
    });
  }
  if (judged.some((j) => j === null)) {
    const v = validateStackFile(row.stack);
    if (!v.ok)
      throw conflict(`The stack of revision ${row.number} no longer validates; open it in the editor and fix it.`, "invalid_stack");
    const live = liveStudy(v.stack, requirements);
    const summary = await runEstimate(v.stack, live);
    for (const e of summary.requirements) {
      if (judged[e.index]) continue;
      judged[e.index] = {
        index: e.index,
        metric: e.metric,
        label: labelOf(e.index),
        unit: e.unit,
        max: e.max,
        target: e.yield,
        reached: e.predictedYield,
        passes: e.passes,
        source: { kind: "estimate", trials: summary.trials, inclinationDeg: LIVE_INCLINATION_DEG },
      };
    }
  }
  const all = judged.filter((j): j is RequirementCheck => j !== null);
  return { requirements: all, failing: all.filter((j) => !j.passes) };
}
