/**
 * The statistics of one measured column: summary with its gaps, normality, capability with
 * its confidence bound, lots, the individuals and moving-range chart in production order,
 * outliers and the histogram. Numbers are in the mapped source's unit when the column is
 * mapped, in the column's own otherwise.
 */
import { and, eq } from "drizzle-orm";
import type { DatasetStatistics } from "@shared/schemas/datasets";
import { findSource, partTolerance, toleranceLimits } from "@shared/datasets/sources";
import { andersonDarling, AD_MIN_N, histogram, outliers, OUTLIER_LIMIT, summarize } from "@shared/datasets/statistics";
import { individualsChart, lotStatistics, processCapability } from "@shared/datasets/process";
import type { MeasureUnit } from "@shared/datasets/units";
import type { StackFile } from "@shared/schemas/stack-file";
import type { Database } from "../db/client";
import { datasetMappings, datasets, stackRevisions } from "../db/schema";
import { badRequest, found } from "../lib/errors";
import type { StoredColumn } from "@shared/schemas/datasets";
import { conversionText, convertedValues, presentValues, type Cells } from "./dataset-values";

function numericColumn(columns: StoredColumn[], key: string, path = "column"): StoredColumn {
  const c = columns.find((x) => x.key === key);
  if (!c)
    throw badRequest(
      `The data set has no column “${key}”.`,
      [{ path, message: `no column “${key}”; the columns are ${columns.map((x) => `“${x.key}”`).join(", ")}` }],
      "unknown_column",
    );
  if (c.kind !== "number")
    throw badRequest(
      `Column “${key}” holds labels, not measurements.`,
      [{ path, message: "a label column cannot be mapped to a tolerance" }],
      "not_numeric",
    );
  return c;
}

/** The lot of each row: the marked lot column's label, else the lot the whole file was sent for. */
export function rowLots(ds: {
  data: Record<string, Cells>;
  lotColumn: string | null;
  lot: string | null;
  rowNumbers: number[];
}): string[] | null {
  if (ds.lotColumn && ds.data[ds.lotColumn]) return ds.data[ds.lotColumn].map((v) => (v === null || v === "" ? "(no lot)" : String(v)));
  if (ds.lot) return ds.rowNumbers.map(() => ds.lot!);
  return null;
}

export async function datasetStatistics(db: Database, workspaceId: string, id: string, column: string): Promise<DatasetStatistics> {
  const [row] = await db
    .select()
    .from(datasets)
    .where(and(eq(datasets.workspaceId, workspaceId), eq(datasets.id, id)));
  const ds = found(row, "The data set");
  const col = numericColumn(ds.columns, column);
  const present = presentValues(ds.data[col.key]);
  const missing = ds.data[col.key].length - present.values.length;
  const [m] = await db
    .select({
      source: datasetMappings.source,
      part: datasetMappings.part,
      unit: datasetMappings.unit,
      nominal: datasetMappings.nominal,
      stack: stackRevisions.stack,
    })
    .from(datasetMappings)
    .innerJoin(stackRevisions, eq(stackRevisions.id, datasetMappings.revisionId))
    .where(and(eq(datasetMappings.datasetId, id), eq(datasetMappings.column, col.key)));
  let values = present.values;
  let unit: string | null = col.unit;
  let converted: DatasetStatistics["converted"] = null;
  let tolerance: DatasetStatistics["tolerance"] = null;
  let limits: { lsl: number; usl: number } | null = null;
  const src = m ? findSource(m.stack as StackFile, m.source) : null;
  const part = m?.part ?? null;
  if (m && src) {
    const c = convertedValues(present.values, m.unit as MeasureUnit, m.nominal, src.unit);
    values = c.values;
    unit = src.unit;
    converted = {
      from: m.unit as MeasureUnit,
      factor: c.factor,
      nominal: m.nominal,
      text: conversionText(m.unit as MeasureUnit, src.unit, m.nominal, c.factor),
    };
    const t = partTolerance(src, part);
    const sigma =
      t.dist === "data" || t.tol === undefined
        ? null
        : t.dist === "normal"
          ? t.tol / (t.sigmas ?? 3)
          : t.dist === "uniform"
            ? t.tol / Math.sqrt(3)
            : t.tol / Math.sqrt(6);
    tolerance = { dist: t.dist, tol: t.tol ?? null, sigmas: t.dist === "normal" ? (t.sigmas ?? 3) : null, mean: t.mean ?? 0, sigma };
    limits = toleranceLimits(t);
  }
  const lotsAll = rowLots(ds);
  const lots = lotsAll ? present.index.map((i) => lotsAll[i]) : null;
  const rows = present.index.map((i) => ds.rowNumbers[i]);
  const s = summarize(values);
  const ad = andersonDarling(values);
  return {
    column: col.key,
    unit,
    converted,
    source: m?.source ?? null,
    part,
    partLabel: src && part !== null ? (src.parts?.[part]?.label ?? null) : null,
    summary: { ...s, missing },
    normality: ad,
    normalityNote: ad
      ? null
      : s.n < AD_MIN_N
        ? `The normality test needs at least ${AD_MIN_N} values; this column has ${s.n}.`
        : "Every value is the same: there is no spread to test.",
    tolerance,
    capability: limits ? processCapability(values, limits.lsl, limits.usl, lots) : null,
    lotColumn: ds.lotColumn,
    lots: lots ? lotStatistics(values, lots, limits) : [],
    controlChart: individualsChart(values, rows, lots),
    outliers: {
      rule: `modified z-score |0.6745·(x − median)/MAD| > ${OUTLIER_LIMIT} (Iglewicz and Hoaglin)`,
      values: outliers(values).map((o) => ({ row: rows[o.index], value: o.value, score: o.score })),
    },
    histogram: histogram(values, limits),
  };
}
