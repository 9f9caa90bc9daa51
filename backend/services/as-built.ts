/**
 * As-built studies: the revision's stack with chosen tolerance sources replaced by measured
 * data sets, either resampled (each draw is one of the measured values; a source measured as
 * several columns draws one unit's whole row) or as the normal fitted to them. The replaced
 * stack is frozen into the study like any other.
 */
import { and, eq } from "drizzle-orm";
import type { AsBuiltEntry, AsBuiltRecord } from "@shared/schemas/datasets";
import { findSource, replaceSource, type StackSource } from "@shared/datasets/sources";
import { summarize } from "@shared/datasets/statistics";
import { conversionFactor, type MeasureUnit } from "@shared/datasets/units";
import { unitText } from "@shared/format";
import { MAX_DATA_VALUES, validateStackFile, type StackFile, type Tolerance } from "@shared/schemas/stack-file";
import type { Database } from "../db/client";
import { datasetMappings, datasets } from "../db/schema";
import { badRequest } from "../lib/errors";
import { convertedValues, pooledRows, presentValues } from "./dataset-values";

type Measured = { name: string; columns: string[]; dropped: number; values: number[] | null; rows: number[][] | null };

/** The source ids a replacement touches, so a pooled tilt and tiltX cannot both be replaced. */
function touched(id: string): string[] {
  const dot = id.indexOf(".");
  const el = id.slice(0, dot),
    rest = id.slice(dot + 1);
  if (rest === "tilt" || rest === "tiltX" || rest === "tiltY") return rest === "tilt" ? [`${el}.tiltX`, `${el}.tiltY`] : [id];
  if (rest === "axis") return [1, 2, 3, 4, 5, 6].map((k) => `${el}.axis.g${k}`);
  return [id];
}

/**
 * The measured values of one source from a data set: the named column, or, with no column,
 * every column mapped to the source (one per part, complete rows only) or its one column.
 */
async function measuredSource(
  db: Pick<Database, "select">,
  workspaceId: string,
  projectId: string,
  e: AsBuiltEntry,
  src: StackSource,
  path: string,
): Promise<Measured> {
  const fail = (field: string, message: string): never => {
    throw badRequest(
      `The as-built study cannot use ${e.source}: ${message}. Nothing was queued.`,
      [{ path: `${path}.${field}`, message }],
      "invalid_as_built",
    );
  };
  const [ds] = await db
    .select()
    .from(datasets)
    .where(and(eq(datasets.workspaceId, workspaceId), eq(datasets.id, e.datasetId)));
  if (!ds || ds.projectId !== projectId)
    throw badRequest(
      "A data set of the as-built study is not in this project.",
      [{ path: `${path}.datasetId`, message: "no data set with this id in the revision's project" }],
      "invalid_as_built",
    );
  const cols = ds.columns;
  const maps = await db.select().from(datasetMappings).where(eq(datasetMappings.datasetId, e.datasetId));
  const mine = maps.filter((m) => m.source === e.source);
  const pooled = mine.filter((m) => m.part !== null);

  if (e.column === undefined) {
    if (pooled.length) {
      const have = new Set(pooled.map((m) => m.part));
      const missing = (src.parts ?? []).filter((p) => !have.has(p.index)).map((p) => p.label);
      if (missing.length) fail("datasetId", `“${ds.name}” has no column for ${missing.join(", ")} of ${e.source}`);
      if (e.mode === "normal")
        fail(
          "mode",
          `${e.source} is measured as ${pooled.length} columns together; resample their rows (a normal fitted to each column would lose how they vary together)`,
        );
      const p = pooledRows(
        ds.data,
        pooled.map((m) => ({ column: m.column, part: m.part!, unit: m.unit as MeasureUnit, nominal: m.nominal })),
        src.unit,
      );
      if (p.rows.length < 2)
        fail(
          "datasetId",
          `“${ds.name}” has ${p.rows.length} complete ${p.rows.length === 1 ? "row" : "rows"} for ${e.source} (${p.dropped} with a gap); at least two are needed`,
        );
      if (p.rows.length * pooled.length > MAX_DATA_VALUES)
        fail("datasetId", `“${ds.name}” holds more than ${MAX_DATA_VALUES} values for ${e.source}`);
      return {
        name: ds.name,
        columns: [...pooled].sort((a, b) => a.part! - b.part!).map((m) => m.column),
        dropped: p.dropped,
        values: null,
        rows: p.rows,
      };
    }
    if (mine.length !== 1) fail("column", `no column of “${ds.name}” is mapped to ${e.source}: map one, or name the column`);
    e = { ...e, column: mine[0].column };
  }
  const column = e.column!;
  const col = cols.find((c) => c.key === column);
  if (!col || col.kind !== "number") fail("column", `no measured column “${column}” in “${ds.name}”`);
  const m = maps.find((x) => x.column === column);
  if (m && m.source !== e.source) fail("source", `“${column}” of “${ds.name}” measures ${m.source}; map it to ${e.source} first`);
  if (m && m.part !== null)
    fail("column", `“${column}” is one of the ${pooled.length} columns of ${e.source}; leave out column to use them together`);
  const unit = (m?.unit as MeasureUnit | undefined) ?? col!.unit;
  if (!unit) fail("column", `give “${column}” a unit by mapping it to ${e.source}`);
  if (conversionFactor(unit!, src.unit) === null) fail("column", `a column in ${unitText(unit!)} cannot replace ${e.source}`);
  const present = presentValues(ds.data[column]);
  const { values } = convertedValues(present.values, unit!, m?.nominal ?? 0, src.unit);
  if (values.length < 2) fail("column", `“${column}” has ${values.length} value; at least two are needed`);
  if (values.length > MAX_DATA_VALUES) fail("column", `“${column}” has more than ${MAX_DATA_VALUES} values`);
  return { name: ds.name, columns: [column], dropped: ds.data[column].length - values.length, values, rows: null };
}

export async function applyAsBuilt(
  db: Database,
  workspaceId: string,
  revision: { projectId: string; stack: StackFile },
  entries: AsBuiltEntry[],
): Promise<{ stack: StackFile; records: AsBuiltRecord[] }> {
  let stack = revision.stack;
  const records: AsBuiltRecord[] = [];
  const seen = new Map<string, string>();
  for (const [i, e] of entries.entries()) {
    const path = `asBuilt[${i}]`;
    const fail = (field: string, message: string): never => {
      throw badRequest(
        `The as-built study cannot use ${e.source}: ${message}. Nothing was queued.`,
        [{ path: `${path}.${field}`, message }],
        "invalid_as_built",
      );
    };
    for (const t of touched(e.source)) {
      const by = seen.get(t);
      if (by) fail("source", by === e.source ? `${e.source} is replaced twice` : `${e.source} and ${by} replace the same tolerance`);
      seen.set(t, e.source);
    }
    if (e.source.startsWith("calibration.")) fail("source", "the calibration residual is a study setting, not an assembly tolerance");
    const src = findSource(stack, e.source);
    if (!src) fail("source", `the stack has no tolerance source ${e.source}`);
    const got = await measuredSource(db, workspaceId, revision.projectId, e, src!, path);
    const flat = got.rows ? got.rows.flat() : got.values!;
    const s = summarize(flat);
    const keep: Pick<Tolerance, "stage" | "owner"> = {
      ...(src!.tolerance.stage ? { stage: src!.tolerance.stage } : {}),
      ...(src!.tolerance.owner ? { owner: src!.tolerance.owner } : {}),
    };
    const tol: Tolerance = got.rows
      ? { dist: "data", rows: got.rows, ...keep }
      : e.mode === "resample"
        ? { dist: "data", values: got.values!, ...keep }
        : // the fitted normal, written as the trade reads a tolerance: ±3σ around the measured mean
          { dist: "normal", tol: 3 * s.std, sigmas: 3, mean: s.mean, ...keep };
    const next = replaceSource(stack, e.source, tol);
    if (!next) fail("source", `${e.source} cannot take measured values`);
    stack = next!;
    records.push({
      ...e,
      ...(got.rows ? {} : { column: got.columns[0] }),
      datasetName: got.name,
      columns: got.columns,
      dropped: got.dropped,
      n: got.rows ? got.rows.length : s.n,
      mean: s.mean,
      std: s.std,
      unit: src!.unit,
      replaced: src!.tolerance as Record<string, unknown>,
    });
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
