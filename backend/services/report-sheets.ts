/**
 * The report's tables as a spreadsheet (exceljs) and as CSV: the same rows as the PDF, numbers
 * kept as numbers, rounded to the resolution each header states beside its unit.
 */
import ExcelJS from "exceljs";
import type { ReportContent } from "@shared/schemas/reports";
import type { ReportMeta } from "./report-pdf";
import { fmtDate } from "./report-format";
import { distLabel } from "@shared/reports/format";
import { formatFixed, roundTo } from "@shared/format";
import {
  describeSupports,
  FRACTION_RESOLUTION,
  positionReference,
  REPORT_RESOLUTION,
  SIGMA_RESOLUTION,
  sourceNominal,
} from "@shared/reports/nominals";
import { MEASUREMENT_SAMPLE, measurementSteps } from "@shared/reports/measurement-plan";
import { placeStack } from "./report-pdf-drawing";

export type Cell = string | number | null;
type Table = { title: string; header: string[]; rows: Cell[][] };

/** The spreadsheet shows every digit of the resolution a header states ("… (um, to 0.1)" → 0.0). */
function formatOf(header: string): string | undefined {
  const m = /to ([0-9.]+)\)$/.exec(header);
  if (!m) return undefined;
  const decimals = m[1].split(".")[1]?.length ?? 0;
  return decimals ? `0.${"0".repeat(decimals)}` : "0";
}

const res = (step: number) => `to ${formatFixed(step, step)}`;
const round = (v: number | null, step: number) => (v === null || !Number.isFinite(v) ? null : roundTo(v, step));

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
    [
      "Targets",
      c.requirements.every((r) => r.passes)
        ? "every requirement of the study is predicted to meet its target"
        : `the study misses ${c.requirements.filter((r) => !r.passes).length} of ${c.requirements.length} targets`,
    ],
    [
      "Resolution",
      `numbers rounded as stated in each header: dimensions in mm to ${REPORT_RESOLUTION.mm}, small heights in um to ${REPORT_RESOLUTION.um}, angles in deg to ${REPORT_RESOLUTION.deg}`,
    ],
    ["Link", meta.link],
  ];
}

/** The supplier's tolerances in one unit, each with its nominal and datum, limits absolute. */
function tolerancesTable(c: ReportContent, unit: "um" | "deg"): Table {
  const r = REPORT_RESOLUTION[unit];
  const sr = SIGMA_RESOLUTION[unit];
  const h = (name: string, step: number = r) => `${name} (${unit}, ${res(step)})`;
  return {
    title: `Tolerances ${unit}`,
    header: [
      "Source",
      "Element",
      "Element kind",
      "Quantity",
      "Datum",
      h("Nominal"),
      h("Target offset"),
      h("Tolerance ±"),
      h("Lower limit"),
      h("Upper limit"),
      "Distribution",
      "Sigmas",
      "Stage",
      `Cpk asked (${res(FRACTION_RESOLUTION.cpk)})`,
      "Cpk raised to study",
      h("Sigma max", sr),
      h("Sigma modelled", sr),
      "Draws",
    ],
    rows: c.tolerances
      .filter((t) => t.unit === unit)
      .map((t) => {
        const n = sourceNominal(t, c.stack);
        return [
          t.source,
          t.elementName,
          t.elementKind,
          t.quantity,
          n.datum,
          round(n.nominal, r),
          round(t.mean, r),
          round(t.tol, r),
          t.tol === null ? null : round(n.nominal + t.mean - t.tol, r),
          t.tol === null ? null : round(n.nominal + t.mean + t.tol, r),
          distLabel(t.dist, t.sigmas),
          t.sigmas,
          t.stage,
          round(t.cpk, FRACTION_RESOLUTION.cpk),
          t.raised ? "yes" : "no",
          round(t.sigmaMax, sr),
          round(t.sigmaModelled, sr),
          t.draws,
        ];
      }),
  };
}

/** Every element's nominal dimensions, where it sits and what it rests on. */
function elementsTable(c: ReportContent): Table {
  const m = REPORT_RESOLUTION.mm;
  const placed = new Map(placeStack(c.stack).map((p) => [p.e.id, p]));
  return {
    title: "Elements",
    header: [
      "Element",
      "Name",
      "Kind",
      "Parent",
      `Size x (mm, ${res(m)})`,
      `Size y (mm, ${res(m)})`,
      `Thickness z (mm, ${res(m)})`,
      `Position x on parent (mm, ${res(m)})`,
      `Position y on parent (mm, ${res(m)})`,
      "Position reference point",
      `Yaw (deg, ${res(REPORT_RESOLUTION.deg)})`,
      `Bond-line thickness (um, ${res(REPORT_RESOLUTION.um)})`,
      "Support points (mm from the element's centre)",
      `Bottom above board top (mm, ${res(m)})`,
      `Top above board top (mm, ${res(m)})`,
      "Sources held by this supplier",
    ],
    rows: c.stack.map((e) => {
      const parent = c.stack.find((p) => p.id === e.parent);
      const p = placed.get(e.id);
      return [
        e.id,
        e.name,
        e.kind,
        e.parent ?? "",
        round(e.size.x, m),
        round(e.size.y, m),
        round(e.size.z, m),
        e.parent ? round(e.position.x, m) : null,
        e.parent ? round(e.position.y, m) : null,
        e.parent ? positionReference(parent?.name ?? e.parent) : "reference frame",
        e.parent ? round(e.yawDeg, REPORT_RESOLUTION.deg) : null,
        e.parent ? round(e.bondThicknessUm, REPORT_RESOLUTION.um) : null,
        e.parent ? describeSupports(e) : "",
        p ? round(p.z0, m) : null,
        p ? round(p.z1, m) : null,
        e.sources.join(" "),
      ];
    }),
  };
}

function planTable(c: ReportContent): Table {
  return {
    title: "Measurement plan",
    header: [
      "Source",
      "What to measure, on which units",
      "Unit",
      "Resolution (in Unit)",
      "Readings per unit",
      "Units to measure",
      "Lower limit (in Unit, to Resolution)",
      "Upper limit (in Unit, to Resolution)",
    ],
    rows: measurementSteps(c).map((s) => {
      const t = s.tolerance;
      const centre = sourceNominal(t, c.stack).nominal + t.mean;
      return [
        t.source,
        s.what,
        s.unit,
        s.resolution,
        s.readingsPerUnit,
        MEASUREMENT_SAMPLE.units,
        t.tol === null ? null : round(centre - t.tol, s.resolution),
        t.tol === null ? null : round(centre + t.tol, s.resolution),
      ];
    }),
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
      `Limit (in Unit, ${res(0.001)})`,
      `Yield target (fraction, ${res(FRACTION_RESOLUTION.yield)})`,
      `Predicted yield (fraction, ${res(FRACTION_RESOLUTION.yield)})`,
      `CI low (95 %, fraction, ${res(FRACTION_RESOLUTION.yield)})`,
      `CI high (95 %, fraction, ${res(FRACTION_RESOLUTION.yield)})`,
      "ppm out (to 1)",
      "Result",
      `Share from this supplier (fraction, ${res(FRACTION_RESOLUTION.share)})`,
      "Fed by this supplier",
    ],
    rows: c.requirements.map((r, i) => [
      `R${i + 1}`,
      r.metric,
      r.description,
      r.unit === "%" ? "%" : "deg",
      round(r.max, 0.001),
      round(r.yield, FRACTION_RESOLUTION.yield),
      round(r.predictedYield, FRACTION_RESOLUTION.yield),
      round(r.ci[0], FRACTION_RESOLUTION.yield),
      round(r.ci[1], FRACTION_RESOLUTION.yield),
      Math.round(r.ppmOut),
      r.passes ? "pass" : "fail",
      round(r.supplierShare, FRACTION_RESOLUTION.share),
      r.fed ? "yes" : "no",
    ]),
  };
}

function sharesTable(c: ReportContent): Table {
  return {
    title: "Shares",
    header: ["Source", ...c.requirements.map((r, i) => `R${i + 1} ${r.metric} (fraction, ${res(FRACTION_RESOLUTION.share)})`)],
    rows: c.tolerances.map((t) => [
      t.source,
      ...c.requirements.map((r) => round(t.feeds.find((f) => f.metric === r.metric)?.share ?? 0, FRACTION_RESOLUTION.share)),
    ]),
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
  const byUnit = (["um", "deg"] as const).map((u) => tolerancesTable(c, u)).filter((t) => t.rows.length > 0);
  return [...byUnit, elementsTable(c), planTable(c), requirementsTable(c), sharesTable(c), assumptionsTable(c)];
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
      const fmt = formatOf(h);
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
