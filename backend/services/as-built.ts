/**
 * As-built studies: the revision's stack with chosen tolerance sources replaced by measured
 * data sets, either resampled (each draw is one of the measured values) or as the normal
 * fitted to them. The replaced stack is frozen into the study like any other.
 */
import type { AsBuiltEntry, AsBuiltRecord } from "@shared/schemas/datasets";
import { findSource, replaceSource } from "@shared/datasets/sources";
import { summarize } from "@shared/datasets/statistics";
import { MAX_DATA_VALUES, validateStackFile, type StackFile, type Tolerance } from "@shared/schemas/stack-file";
import type { Database } from "../db/client";
import { badRequest } from "../lib/errors";
import { columnForSource } from "./datasets";

export async function applyAsBuilt(
  db: Database,
  workspaceId: string,
  revision: { projectId: string; stack: StackFile },
  entries: AsBuiltEntry[],
): Promise<{ stack: StackFile; records: AsBuiltRecord[] }> {
  let stack = revision.stack;
  const records: AsBuiltRecord[] = [];
  const seen = new Set<string>();
  for (const [i, e] of entries.entries()) {
    const path = `asBuilt[${i}]`;
    const fail = (field: string, message: string): never => {
      throw badRequest(`The as-built study cannot use ${e.source}: ${message}. Nothing was queued.`, [{ path: `${path}.${field}`, message }], "invalid_as_built");
    };
    if (seen.has(e.source)) fail("source", `${e.source} is replaced twice`);
    seen.add(e.source);
    if (e.source.startsWith("calibration.")) fail("source", "the calibration residual is a study setting, not an assembly tolerance");
    const src = findSource(stack, e.source);
    if (!src) fail("source", `the stack has no tolerance source ${e.source}`);
    const { name, values } = await columnForSource(db, workspaceId, revision.projectId, e.datasetId, e.column, e.source, src!.unit, path);
    if (values.length < 2) fail("column", `“${e.column}” has ${values.length} value; at least two are needed`);
    if (values.length > MAX_DATA_VALUES) fail("column", `“${e.column}” has more than ${MAX_DATA_VALUES} values`);
    const s = summarize(values);
    const keep: Pick<Tolerance, "stage" | "owner"> = {
      ...(src!.tolerance.stage ? { stage: src!.tolerance.stage } : {}),
      ...(src!.tolerance.owner ? { owner: src!.tolerance.owner } : {}),
    };
    const tol: Tolerance =
      e.mode === "resample"
        ? { dist: "data", values, ...keep }
        : // the fitted normal, written as the trade reads a tolerance: ±3σ around the measured mean
          { dist: "normal", tol: 3 * s.std, sigmas: 3, mean: s.mean, ...keep };
    stack = replaceSource(stack, e.source, tol)!;
    records.push({ ...e, datasetName: name, n: s.n, mean: s.mean, std: s.std, unit: src!.unit, replaced: src!.tolerance as Record<string, unknown> });
  }
  const v = validateStackFile(stack);
  if (!v.ok) {
    throw badRequest(
      "The as-built stack is not valid; nothing was queued.",
      v.issues.map((x) => ({ path: `stack.${x.path}`, message: x.message })),
      "invalid_as_built",
    );
  }
  return { stack: v.stack, records };
}

/** "As built: mag.yaw, mag.bondLine" for a study whose label was left empty. */
export function asBuiltLabel(records: AsBuiltRecord[]): string {
  const list = records.map((r) => r.source).join(", ");
  const label = `As built: ${list}`;
  return label.length > 120 ? `${label.slice(0, 117)}…` : label;
}
