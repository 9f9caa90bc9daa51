/** The report's tables as a spreadsheet (exceljs) and as CSV: the same rows as the PDF, with numbers kept as numbers. */
import ExcelJS from "exceljs";
import type { ReportContent } from "@shared/schemas/reports";
import type { ReportMeta } from "./report-pdf";
import { fmtDate } from "./report-format";
import { distLabel } from "@shared/reports/format";

export type Cell = string | number | null;
type Table = { title: string; header: string[]; rows: Cell[][]; numFmt?: Record<number, string> };

const unitText = (u: "um" | "deg") => (u === "deg" ? "deg" : "um");

function facts(c: ReportContent, meta: ReportMeta): Array<[string, Cell]> {
  return [
    ["Report", meta.code],
    ["Revision", meta.revision],
    ["Status", meta.status],
    ["Date", fmtDate(meta.status === "released" ? meta.releasedAt : meta.createdAt)],
    ["Released by", meta.releasedByName ?? ""],
    ["Prepared by", meta.createdByName ?? ""],
    ["Supplier", c.supplier.name],
    ["Project", c.project.name],
    ["Stack revision", c.revision.number],
    ["Stack name", c.revision.name],
    ["Study", c.study.number],
    ["Study label", c.study.label],
    ["Capability asked (Cpk)", c.capability.cpk],
    ["Link", meta.link],
  ];
}

function tolerancesTable(c: ReportContent): Table {
  return {
    title: "Tolerances",
    header: [
      "Source",
      "Element",
      "Element kind",
      "Quantity",
      "Unit",
      "Tolerance (±)",
      "Target (mean)",
      "Lower limit",
      "Upper limit",
      "Distribution",
      "Sigmas",
      "Stage",
      "Cpk asked",
      "Cpk raised to study",
      "Sigma max",
      "Sigma modelled",
      "Draws",
    ],
    rows: c.tolerances.map((t) => [
      t.source,
      t.elementName,
      t.elementKind,
      t.quantity,
      unitText(t.unit),
      t.tol,
      t.mean,
      t.tol === null ? null : t.mean - t.tol,
      t.tol === null ? null : t.mean + t.tol,
      distLabel(t.dist, t.sigmas),
      t.sigmas,
      t.stage,
      Number(t.cpk.toFixed(4)),
      t.raised ? "yes" : "no",
      t.sigmaMax,
      t.sigmaModelled,
      t.draws,
    ]),
    numFmt: { 12: "0.00", 14: "0.0000", 15: "0.0000" },
  };
}

function requirementsTable(c: ReportContent): Table {
  return {
    title: "Requirements",
    header: [
      "#",
      "Metric",
      "Description",
      "Unit",
      "Limit",
      "Yield target",
      "Predicted yield",
      "CI low (95 %)",
      "CI high (95 %)",
      "ppm out",
      "Result",
      "Share from this supplier",
      "Fed by this supplier",
    ],
    rows: c.requirements.map((r, i) => [
      `R${i + 1}`,
      r.metric,
      r.description,
      r.unit === "%" ? "%" : "deg",
      r.max,
      r.yield,
      r.predictedYield,
      r.ci[0],
      r.ci[1],
      Math.round(r.ppmOut),
      r.passes ? "pass" : "fail",
      r.supplierShare,
      r.fed ? "yes" : "no",
    ]),
    numFmt: { 5: "0.00%", 6: "0.00%", 7: "0.00%", 8: "0.00%", 11: "0.0%" },
  };
}

function sharesTable(c: ReportContent): Table {
  return {
    title: "Shares",
    header: ["Source", ...c.requirements.map((r, i) => `R${i + 1} ${r.metric}`)],
    rows: c.tolerances.map((t) => [t.source, ...c.requirements.map((r) => t.feeds.find((f) => f.metric === r.metric)?.share ?? 0)]),
    numFmt: Object.fromEntries(c.requirements.map((_r, i) => [i + 1, "0.0%"])),
  };
}

function assumptionsTable(c: ReportContent): Table {
  const s = c.study;
  return {
    title: "Assumptions",
    header: ["Setting", "Value"],
    rows: [
      ["Field inclination (deg)", s.inclinationDeg],
      [
        "Inclination from",
        s.site ? `${s.site.model} at ${s.site.latitudeDeg}, ${s.site.longitudeDeg}, ${s.site.altitudeKm} km on ${s.site.date}` : "entered",
      ],
      ["Calibration after", s.calibration.after],
      ["Calibration residual", s.calibration.residual ?? ""],
      ["Trials", s.trials],
      ["Seed", s.seed],
      ["Sampling", s.sampling],
      ["Heading step (deg)", s.headingStepDeg],
      ["Tilts (pitch/roll deg)", s.tilts.map((t) => `${t.pitchDeg}/${t.rollDeg}`).join("; ")],
      ["Engine", s.engine],
      ["Built", c.builtAt],
    ],
  };
}

function tables(c: ReportContent): Table[] {
  return [tolerancesTable(c), requirementsTable(c), sharesTable(c), assumptionsTable(c)];
}

const HEADER_FILL = { type: "pattern" as const, pattern: "solid" as const, fgColor: { argb: "FFF7F5F0" } };

export async function renderReportXlsx(c: ReportContent, meta: ReportMeta): Promise<Buffer> {
  const wb = new ExcelJS.Workbook();
  wb.creator = "Orthostack";
  wb.created = new Date(meta.releasedAt ?? c.builtAt);
  wb.modified = wb.created;
  wb.title = `${meta.code} revision ${meta.revision}`;

  const cover = wb.addWorksheet("Report");
  cover.columns = [{ width: 26 }, { width: 70 }];
  cover.addRow([`Orthostack supplier tolerance report`]).font = { bold: true, size: 13 };
  cover.addRow([]);
  for (const [k, v] of facts(c, meta)) {
    const row = cover.addRow([k, v]);
    row.getCell(1).font = { bold: true, color: { argb: "FF5D6670" } };
    if (k === "Capability asked (Cpk)") row.getCell(2).numFmt = "0.00";
    row.getCell(2).alignment = { horizontal: "left" };
  }
  cover.addRow([]);
  cover.addRow(["Cautions"]).font = { bold: true, color: { argb: "FFB91C1C" } };
  for (const t of c.cautions) {
    const row = cover.addRow([t]);
    cover.mergeCells(row.number, 1, row.number, 2);
    row.getCell(1).alignment = { wrapText: true, vertical: "top" };
    row.height = 32;
  }

  for (const t of tables(c)) {
    const ws = wb.addWorksheet(t.title, { views: [{ state: "frozen", ySplit: 1 }] });
    const header = ws.addRow(t.header);
    header.font = { bold: true };
    header.eachCell((cell) => {
      cell.fill = HEADER_FILL;
      cell.border = { bottom: { style: "thin", color: { argb: "FFBDB6A6" } } };
    });
    for (const r of t.rows) ws.addRow(r);
    t.header.forEach((h, i) => {
      const col = ws.getColumn(i + 1);
      const longest = Math.max(h.length, ...t.rows.map((r) => String(r[i] ?? "").length));
      col.width = Math.min(60, Math.max(9, longest + 2));
      const fmt = t.numFmt?.[i];
      if (fmt) col.numFmt = fmt;
    });
  }
  const out = await wb.xlsx.writeBuffer();
  return Buffer.from(out as ArrayBuffer);
}

/**
 * Text a spreadsheet program would read as a formula (or, after a tab or carriage return, as
 * the start of one) gets a leading apostrophe: names typed by people (project, stack, element,
 * supplier, user) reach the CSV, and `=HYPERLINK(...)` or `@SUM(...)` there would run when the
 * file is opened. The usual rule for CSV formula injection; numbers are never text here.
 */
export function inertText(s: string): string {
  return /^[=+\-@\t\r]/.test(s) ? `'${s}` : s;
}

export function csvCell(v: Cell): string {
  if (v === null || v === undefined) return "";
  const s = typeof v === "number" ? (Number.isFinite(v) ? String(v) : "") : inertText(v);
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

/** One CSV file holding each table under its title, separated by a blank line (UTF-8 with BOM). */
export function renderReportCsv(c: ReportContent, meta: ReportMeta): Buffer {
  const lines: string[] = [];
  const row = (cells: Cell[]) => lines.push(cells.map(csvCell).join(","));
  row(["Orthostack supplier tolerance report"]);
  for (const [k, v] of facts(c, meta)) row([k, v]);
  for (const t of tables(c)) {
    lines.push("");
    row([t.title]);
    row(t.header);
    for (const r of t.rows) row(r);
  }
  lines.push("");
  row(["Cautions"]);
  for (const t of c.cautions) row([t]);
  return Buffer.from(`\uFEFF${lines.join("\r\n")}\r\n`, "utf8");
}
