/**
 * A finished study's figures as a spreadsheet (exceljs) and as CSV: the metrics with every
 * statistic of MODEL.md §7 (rounded, with units), the requirements, the contributors and the
 * compass heading envelope. Numbers stay numbers; units sit in their own column.
 */
import ExcelJS from "exceljs";
import type { Study } from "@shared/schemas/studies";
import type { ResultFile } from "@shared/schemas/result-file";
import { metricLabel } from "@shared/metrics";
import { unitText } from "@shared/format";
import { mcShares } from "@shared/contributor-significance";
import { conflict } from "../lib/errors";
import { csvCell, type Cell } from "./report-sheets";

type Table = { title: string; header: string[]; rows: Cell[][] };

/** Six significant figures: beyond the Monte Carlo error of any study we run, short to read. */
const r6 = (v: number | null | undefined): Cell => (v === null || v === undefined || !Number.isFinite(v) ? null : Number(v.toPrecision(6)));
/** A fraction as a percentage, to 1e-4 %: yields such as 99.9937 % keep their digits. */
const pct = (v: number | null | undefined): Cell =>
  v === null || v === undefined || !Number.isFinite(v) ? null : Number((v * 100).toFixed(4));

function facts(s: Study, r: ResultFile): Array<[string, Cell]> {
  return [
    ["Study", s.number],
    ["Label", s.label],
    ["Stack revision", s.revisionNumber],
    ["Trials", r.trials],
    ["Seed", r.seed],
    ["Sampling", r.sampling === "lhs" ? "Latin hypercube" : "random"],
    ["Calibration after", r.calibration],
    ["Stopped early", r.stopped ? "yes" : "no"],
    ["Engine", r.engine],
    ["Finished", s.finishedAt ?? ""],
  ];
}

export function studyTables(r: ResultFile): Table[] {
  const metrics: Table = {
    title: "Metrics",
    header: [
      "Metric",
      "Metric id",
      "Unit",
      "Mean",
      "Std deviation",
      "P50 of absolute value",
      "P95 of absolute value",
      "P99 of absolute value",
      "P99.73 of absolute value",
      "Max of absolute value",
      "Smallest value",
      "Largest value",
      "95 % interval low",
      "95 % interval high",
    ],
    rows: Object.entries(r.metrics).map(([id, m]) => [
      metricLabel(id),
      id,
      unitText(m.unit),
      r6(m.mean),
      r6(m.std),
      r6(m.p50),
      r6(m.p95),
      r6(m.p99),
      r6(m.p9973),
      r6(m.max),
      r6(m.minValue),
      r6(m.maxValue),
      r6(m.interval95?.[0]),
      r6(m.interval95?.[1]),
    ]),
  };
  const unitOf = (id: string) => unitText(r.metrics[id]?.unit ?? (id.includes("Pct") ? "%" : "deg"));
  const requirements: Table = {
    title: "Requirements",
    header: [
      "Metric",
      "Metric id",
      "Unit",
      "Limit on absolute value",
      "Yield target (%)",
      "Predicted yield (%)",
      "95 % CI low (%)",
      "95 % CI high (%)",
      "Out (ppm)",
      "Meets target",
      "Demonstrated",
      "Limit at target",
    ],
    rows: r.requirements.map((q) => [
      metricLabel(q.metric),
      q.metric,
      unitOf(q.metric),
      q.max,
      pct(q.yield),
      pct(q.predictedYield),
      pct(q.ci[0]),
      pct(q.ci[1]),
      r6(q.ppmOut),
      q.passes ? "yes" : "no",
      q.demonstrated ? "yes" : "no",
      r6(q.limitAtTarget),
    ]),
  };
  // the Monte Carlo shares as the study page reads them: each with its 95 % interval from the
  // regression, and whether it is told apart from zero; a source the metric does not depend
  // on at all (linearised sensitivity exactly zero) is said to be so, not given a noise share
  const draws = new Map(r.sources.map((x) => [x.id, x.draws] as const));
  const contributors: Table = {
    title: "Contributors",
    header: [
      "Metric",
      "Metric id",
      "Source",
      "Linearised share (%)",
      "Monte Carlo share (%)",
      "Monte Carlo share 95 % low (%)",
      "Monte Carlo share 95 % high (%)",
      "Monte Carlo share told from zero",
      "Basis",
      "Monte Carlo R²",
    ],
    rows: r.contributors.flatMap((c) => {
      const mc = mcShares(c, r.trials, (id) => draws.get(id) ?? 1);
      return c.sources.map((s) => {
        const m = mc.get(s.source);
        return [
          metricLabel(c.metric),
          c.metric,
          s.source,
          pct(s.linearShare),
          s.linearContribution === 0 ? null : pct(s.mcShare),
          pct(m?.lo),
          pct(m?.hi),
          s.linearContribution === 0 ? "no sensitivity" : m ? (m.significant ? "yes" : "no") : null,
          c.basis === "variance" ? "variance" : "mean square",
          r6(c.mcR2),
        ];
      });
    }),
  };
  const envelope: Table = {
    title: "Heading envelope",
    header: [
      "Pitch (°)",
      "Roll (°)",
      "Heading (°)",
      "P5 error (°)",
      "P50 error (°)",
      "P95 error (°)",
      "Smallest error (°)",
      "Largest error (°)",
    ],
    rows: (r.envelope?.points ?? []).map((p) => [
      p.pitchDeg,
      p.rollDeg,
      p.headingDeg,
      r6(p.p5),
      r6(p.p50),
      r6(p.p95),
      r6(p.min),
      r6(p.max),
    ]),
  };
  return [metrics, requirements, contributors, envelope];
}

function resultOf(s: Study): ResultFile {
  if (s.status !== "finished" || !s.result)
    throw conflict("The study has no result yet: it can be exported once it has finished.", "not_finished");
  return s.result;
}

const HEADER_FILL = { type: "pattern" as const, pattern: "solid" as const, fgColor: { argb: "FFF7F5F0" } };

export async function studyXlsx(s: Study): Promise<Buffer> {
  const r = resultOf(s);
  const wb = new ExcelJS.Workbook();
  wb.creator = "Orthostack";
  wb.title = `Study ${s.number}`;
  const cover = wb.addWorksheet("Study");
  cover.columns = [{ width: 22 }, { width: 50 }];
  for (const [k, v] of facts(s, r)) {
    const row = cover.addRow([k, v]);
    row.getCell(1).font = { bold: true };
    row.getCell(2).alignment = { horizontal: "left" };
  }
  for (const t of studyTables(r)) {
    const ws = wb.addWorksheet(t.title, { views: [{ state: "frozen", ySplit: 1 }] });
    const header = ws.addRow(t.header);
    header.font = { bold: true };
    header.eachCell((cell) => {
      cell.fill = HEADER_FILL;
    });
    for (const row of t.rows) ws.addRow(row);
    t.header.forEach((h, i) => {
      const longest = Math.max(h.length, ...t.rows.slice(0, 200).map((row) => String(row[i] ?? "").length));
      ws.getColumn(i + 1).width = Math.min(50, Math.max(9, longest + 2));
    });
  }
  return Buffer.from((await wb.xlsx.writeBuffer()) as ArrayBuffer);
}

/** One CSV file: the study's facts, then each table under its title after a blank line (UTF-8 with BOM). */
export function studyCsv(s: Study): Buffer {
  const r = resultOf(s);
  const lines: string[] = [];
  const row = (cells: Cell[]) => lines.push(cells.map(csvCell).join(","));
  row(["Orthostack study results"]);
  for (const [k, v] of facts(s, r)) row([k, v]);
  for (const t of studyTables(r)) {
    lines.push("");
    row([t.title]);
    row(t.header);
    for (const x of t.rows) row(x);
  }
  return Buffer.from(`\uFEFF${lines.join("\r\n")}\r\n`, "utf8");
}
