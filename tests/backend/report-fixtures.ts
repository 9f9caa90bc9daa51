/** Finished studies on approved revisions, built in the database, for the report tests and the role table. */
import { randomUUID } from "node:crypto";
import { readFileSync } from "node:fs";
import { eq, sql } from "drizzle-orm";
import type { Database } from "@backend/db/client";
import { projects, stackRevisions, studies, studyResults } from "@backend/db/schema";
import { runStudy } from "@shared/engine/study";
import type { ReportContent } from "@shared/schemas/reports";
import type { ResultFile } from "@shared/schemas/result-file";
import { validateStackFile, type StackFile } from "@shared/schemas/stack-file";
import { validateStudy } from "@shared/schemas/study-file";

const fixture = (name: string) => JSON.parse(readFileSync(new URL(`../fixtures/${name}`, import.meta.url), "utf8"));

export const LARKFIELD = "Larkfield Assembly";

/**
 * The reference stack with owners: Larkfield Assembly holds the die attach and die placement
 * (one owner written in other case and with spaces, as people type), Fenmoor the substrate
 * bow, the board maker the board; the sensing axes stay in-house.
 */
export function ownedStack(): StackFile {
  const s = fixture("stack-reference.json") as StackFile;
  const el = (id: string) => s.elements.find((e) => e.id === id)!;
  el("board").bowUm!.owner = "Quillon Boardworks";
  el("pkg").bowUm!.owner = "Fenmoor Substrates";
  el("pkg").bondLine!.heightTol!.owner = "Quillon Boardworks";
  for (const id of ["asic", "gyro", "accel", "mag"]) {
    el(id).bondLine!.heightTol!.owner = LARKFIELD;
    el(id).placementTol!.yawDeg!.owner = LARKFIELD;
  }
  el("mag").placementTol!.yawDeg!.owner = "  larkfield ASSEMBLY ";
  for (const id of ["gyro", "accel", "mag"]) (el(id).axisTol as { owner?: string }).owner = "Sensor die fab (in-house)";
  return s;
}

export const STUDY = { ...fixture("study-reference.json"), trials: 2000, seed: 11 };

const results = new Map<string, ResultFile>();
/** A real engine result (small, in this thread), cached per stack. */
export function resultFor(stack: StackFile, study = STUDY): ResultFile {
  const key = JSON.stringify([stack, study]);
  let r = results.get(key);
  if (!r) {
    const sv = validateStackFile(stack);
    if (!sv.ok) throw new Error(`fixture stack: ${JSON.stringify(sv.issues)}`);
    const v = validateStudy(study, sv.stack);
    if (!v.ok) throw new Error(`fixture study: ${JSON.stringify(v.issues)}`);
    r = runStudy(sv.stack, v.study);
    results.set(key, r);
  }
  return r;
}

/** A project with an approved revision and a finished study on it, written straight into the tables. */
export async function insertFinishedStudy(
  db: Database,
  opts: {
    workspaceId: string;
    projectId?: string;
    stack?: StackFile;
    revisionStatus?: "draft" | "in_review" | "approved";
    studyStatus?: "finished" | "running";
  },
) {
  const stack = opts.stack ?? ownedStack();
  const projectId =
    opts.projectId ??
    (
      await db
        .insert(projects)
        .values({
          workspaceId: opts.workspaceId,
          name: `Report fixture ${Date.now().toString(36)}-${Math.random().toString(36).slice(2, 6)}`,
        })
        .returning()
    )[0].id;
  const [{ nextRev }] = await db
    .select({ nextRev: sql<number>`coalesce(max(${stackRevisions.number}), 0)::int + 1` })
    .from(stackRevisions)
    .where(eq(stackRevisions.projectId, projectId));
  const status = opts.revisionStatus ?? "approved";
  const [rev] = await db
    .insert(stackRevisions)
    .values({
      workspaceId: opts.workspaceId,
      projectId,
      number: nextRev,
      status,
      stack,
      requirements: STUDY.requirements,
      ...(status === "approved" ? { approvedAt: new Date() } : {}),
    })
    .returning();
  const [{ nextStudy }] = await db
    .select({ nextStudy: sql<number>`coalesce(max(${studies.number}), 0)::int + 1` })
    .from(studies)
    .where(eq(studies.projectId, projectId));
  const studyStatus = opts.studyStatus ?? "finished";
  const [study] = await db
    .insert(studies)
    .values({
      workspaceId: opts.workspaceId,
      projectId,
      revisionId: rev.id,
      number: nextStudy,
      label: "fixture",
      status: studyStatus,
      study: STUDY,
      stack,
      trialsTotal: STUDY.trials,
      trialsDone: studyStatus === "finished" ? STUDY.trials : 0,
      ...(studyStatus === "finished" ? { startedAt: new Date(), finishedAt: new Date() } : {}),
    })
    .returning();
  if (studyStatus === "finished") {
    const result = resultFor(stack);
    await db.insert(studyResults).values({
      studyId: study.id,
      result,
      passes: result.requirements.every((r) => r.passes),
    });
  }
  return { projectId, revisionId: rev.id, studyId: study.id };
}

/** RFC 4180 rows (quoted fields may hold commas, quotes and line breaks). */
export function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let cell = "";
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const ch = text[i];
    if (quoted) {
      if (ch === '"' && text[i + 1] === '"') {
        cell += '"';
        i++;
      } else if (ch === '"') quoted = false;
      else cell += ch;
    } else if (ch === '"') quoted = true;
    else if (ch === ",") {
      row.push(cell);
      cell = "";
    } else if (ch === "\r" && text[i + 1] === "\n") {
      row.push(cell);
      rows.push(row);
      row = [];
      cell = "";
      i++;
    } else cell += ch;
  }
  if (cell || row.length) rows.push([...row, cell]);
  return rows;
}

/**
 * The content of a report row a test writes straight into the database: well-formed (the API
 * checks every answer against its schema), with nothing measured in it. For tests about who may
 * see or send what, not about what a report says.
 */
export function emptyReportContent(parts: {
  projectId: string;
  /** the revision the report names; a made-up id where the test has none */
  revisionId?: string;
  supplier: { id: string; name: string; kind?: string };
}): ReportContent {
  return {
    format: "orthostack.report/1",
    builtAt: "2026-01-05T10:00:00.000Z",
    project: { id: parts.projectId, name: "Test project" },
    revision: { id: parts.revisionId ?? randomUUID(), number: 1, name: "Test stack", approvedAt: null, approvedByName: null },
    study: {
      id: randomUUID(),
      number: 1,
      label: "",
      finishedAt: null,
      trials: 0,
      seed: 0,
      engine: "none",
      sampling: "random",
      inclinationDeg: 0,
      site: null,
      calibration: { after: "none", residual: null },
      headingStepDeg: 0,
      tilts: [],
      passes: null,
    },
    supplier: { id: parts.supplier.id, name: parts.supplier.name, kind: parts.supplier.kind ?? "other" },
    capability: { cpk: 1.33, overrides: {} },
    tolerances: [],
    requirements: [],
    contributors: [],
    envelope: null,
    headingLimit: null,
    stack: [],
    cautions: [],
  };
}
