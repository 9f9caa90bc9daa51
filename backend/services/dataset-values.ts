/**
 * The values of a data set as the statistics and the as-built study use them: gaps left out
 * (a pooled source keeps only the rows where every one of its columns has a value), the
 * mapping's nominal taken off and the unit converted to the source's.
 */
import { conversionFactor, type MeasureUnit, type SourceUnit } from "@shared/datasets/units";
import { unitText } from "@shared/format";
import { badRequest } from "../lib/errors";

export type Cells = Array<number | string | null>;

/** Values of a measured column without its gaps, with the index of each in the file's rows. */
export function presentValues(raw: Cells): { values: number[]; index: number[] } {
  const values: number[] = [];
  const index: number[] = [];
  raw.forEach((v, i) => {
    if (typeof v === "number") {
      values.push(v);
      index.push(i);
    }
  });
  return { values, index };
}

/**
 * The values of a measured column in the unit of the source it is mapped to, with the
 * mapping's nominal taken off: the deviations the engine draws.
 */
export function convertedValues(raw: number[], unit: MeasureUnit, nominal: number, to: SourceUnit): { values: number[]; factor: number } {
  const factor = conversionFactor(unit, to);
  if (factor === null)
    throw badRequest(`A column in ${unitText(unit)} cannot measure a source in ${unitText(to)}.`, undefined, "invalid_mapping");
  return { values: raw.map((v) => (v - nominal) * factor), factor };
}

const num = (v: number) => String(Number(v.toPrecision(6)));

/** What was done to the measured values, in words: no "converted from µm to µm". */
export function conversionText(unit: MeasureUnit, to: SourceUnit, nominal: number, factor: number): string {
  const steps: string[] = [];
  if (nominal !== 0) steps.push(`the nominal ${num(nominal)} ${unitText(unit)} taken off each value`);
  if (unit !== to) steps.push(`${unitText(unit)} converted to ${unitText(to)} (× ${num(factor)})`);
  return steps.length ? `${steps.join("; ")}.` : `Values used as measured, in ${unitText(to)}.`;
}

export type PooledColumn = { column: string; part: number; unit: MeasureUnit; nominal: number };

/**
 * Complete rows of a pooled source: one row per unit whose every column has a value,
 * converted to the source's unit, in part order; `dropped` counts the rows left out.
 */
export function pooledRows(
  data: Record<string, Cells>,
  columns: PooledColumn[],
  to: SourceUnit,
): { rows: number[][]; dropped: number; total: number } {
  const sorted = [...columns].sort((a, b) => a.part - b.part);
  const factors = sorted.map((c) => conversionFactor(c.unit, to));
  if (factors.some((f) => f === null)) throw badRequest("A pooled column's unit cannot measure its source.", undefined, "invalid_mapping");
  const total = data[sorted[0].column]?.length ?? 0;
  const rows: number[][] = [];
  for (let i = 0; i < total; i++) {
    const row: number[] = [];
    for (let k = 0; k < sorted.length; k++) {
      const v = data[sorted[k].column]?.[i];
      if (typeof v !== "number") break;
      row.push((v - sorted[k].nominal) * factors[k]!);
    }
    if (row.length === sorted.length) rows.push(row);
  }
  return { rows, dropped: total - rows.length, total };
}
