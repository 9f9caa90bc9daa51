/** The report's tables: the supplier's tolerances with nominals and datums, where they matter, the requirements, the contributors, the envelope and the assumptions. */
import type { ReportContent } from "@shared/schemas/reports";
import { contributorChart, contributorChartHeight, envelopeChart, OURS } from "./report-charts";
import { box, COLOURS, FAINT, INK, LINE, measure, MUTED, PAPER, paragraph, rule, text } from "./pdf-draw";
import {
  formatCount,
  formatFraction,
  formatIndex,
  formatNumber,
  formatNumberUnit,
  formatShare,
  formatWritten,
  formatYieldRange,
} from "@shared/format";
import { distLabel } from "@shared/reports/format";
import { sourceNominal } from "@shared/reports/nominals";
import { fmtDate, fmtDateTime } from "./report-format";
import { BOTTOM, CW, ML, section, tableHeader, type Col, type Layout } from "./report-pdf-layout";
import type { ReportMeta } from "./report-pdf";

export function toleranceTable(l: Layout, c: ReportContent) {
  const { doc } = l;
  section(
    l,
    "Tolerances you hold",
    `Each row is a tolerance source of stack revision ${c.revision.number} whose owner is ${c.supplier.name}, with the nominal it sits on and the datum it is measured from. ` +
      `The window is the nominal plus the target offset, ± the tolerance. ` +
      `The capability asked applies to the process that makes it, measured on production parts: Cpk = min(USL − x̄, x̄ − LSL) / 3s. ` +
      `σ max is the largest standard deviation of a process centred on the target that meets it; σ modelled is the spread the study sampled.`,
  );
  const cols: Col[] = [
    { key: "source", label: "Source", w: 74 },
    { key: "quantity", label: "Quantity, datum", w: 124 },
    { key: "nominal", label: "Nominal", w: 46, align: "right" },
    { key: "tol", label: "Tolerance", w: 46, align: "right" },
    { key: "dist", label: "Distribution", w: 54 },
    { key: "stage", label: "Stage", w: 40 },
    { key: "cpk", label: "Cpk ≥", w: 28, align: "right" },
    { key: "smax", label: "σ max", w: 44, align: "right" },
    { key: "smod", label: "σ model", w: 43.28, align: "right" },
  ];
  const sourceStyle = { size: 7.5, weight: "bold" as const, lineHeight: 9 };
  const elementStyle = { size: 6.8, color: MUTED, lineHeight: 8.4 };
  const quantityStyle = { size: 7, lineHeight: 9 };
  const datumStyle = { size: 6.4, color: MUTED, lineHeight: 8 };
  l.ensure(40);
  l.y += tableHeader(doc, cols, ML, l.y);
  let anyRaised = false;
  c.tolerances.forEach((t, i) => {
    const nominal = sourceNominal(t, c.stack);
    const datum = nominal.datum ? `datum: ${nominal.datum}` : "";
    const onElement = `on ${t.elementName}`;
    const sw = cols[0].w - 8;
    const qw = cols[1].w - 8;
    const sh = paragraph(doc, t.source, 0, 0, sw, sourceStyle, false) + paragraph(doc, onElement, 0, 0, sw, elementStyle, false);
    const qh =
      paragraph(doc, t.quantity, 0, 0, qw, quantityStyle, false) + (datum ? paragraph(doc, datum, 0, 0, qw, datumStyle, false) : 0);
    const rh = Math.max(20, sh + 10, qh + 10, t.mean ? 26 : 0);
    if (l.y + rh > BOTTOM) {
      l.newPage();
      l.y += tableHeader(doc, cols, ML, l.y);
    }
    if (i % 2 === 1) box(doc, ML, l.y, CW, rh, { fill: "#fcfbf8" });
    const y = l.y + 6;
    let x = ML;
    const cell = (k: number) => {
      const cx = x;
      x += cols[k].w;
      return cx + 4;
    };
    const sx = cell(0);
    const sourceH = paragraph(doc, t.source, sx, y, sw, sourceStyle);
    paragraph(doc, onElement, sx, y + sourceH, sw, elementStyle);
    const qx = cell(1);
    const quantityH = paragraph(doc, t.quantity, qx, y, qw, quantityStyle);
    if (datum) paragraph(doc, datum, qx, y + quantityH, qw, datumStyle);
    text(doc, nominal.text, cell(2), y, { size: 7.5, width: cols[2].w - 8, align: "right" });
    const tx = cell(3);
    text(doc, formatWritten(t.tol, t.unit, "±"), tx, y, { size: 7.5, weight: "bold", width: cols[3].w - 8, align: "right" });
    if (t.mean)
      text(doc, `target ${t.mean > 0 ? "+" : ""}${formatWritten(t.mean, t.unit)}`, tx - 20, y + 10, {
        size: 6.2,
        color: MUTED,
        width: cols[3].w + 12,
        align: "right",
      });
    paragraph(doc, distLabel(t.dist, t.sigmas), cell(4), y, cols[4].w - 8, { size: 7, lineHeight: 9 });
    text(doc, t.stage, cell(5), y, { size: 7.5, width: cols[5].w - 8 });
    anyRaised ||= t.raised;
    text(doc, `${formatIndex(t.cpk)}${t.raised ? "*" : ""}`, cell(6), y, {
      size: 7.5,
      weight: "bold",
      color: OURS,
      width: cols[6].w - 8,
      align: "right",
    });
    text(doc, formatNumberUnit(t.sigmaMax, t.unit), cell(7), y, { size: 7.5, weight: "bold", width: cols[7].w - 8, align: "right" });
    text(doc, formatNumberUnit(t.sigmaModelled, t.unit), cell(8), y, { size: 7.5, color: MUTED, width: cols[8].w - 8, align: "right" });
    l.y += rh;
    rule(doc, ML, l.y, ML + CW, LINE, 0.5);
  });
  l.y += 6;
  const notes = [
    "Normal tolerances are read as ±3σ unless the distribution says otherwise; uniform and triangular tolerances span the whole window.",
    c.tolerances.some((t) => /\.(x|y)$/.test(t.source))
      ? "Placement offsets (x, y) move an element without turning it: they matter for overhang and clearance, not for the angles this study predicts."
      : "",
    anyRaised
      ? "* Raised above the Cpk chosen for this report: the study assumed a tighter process for this source, and its predictions hold only if the process is at least that capable."
      : "",
  ].filter(Boolean);
  for (const n of notes) {
    const h = paragraph(doc, n, ML, 0, CW, { size: 7, color: MUTED }, false);
    l.ensure(h + 2);
    paragraph(doc, n, ML, l.y, CW, { size: 7, color: MUTED });
    l.y += h + 2;
  }
  l.y += 10;
}

export function shareMatrix(l: Layout, c: ReportContent) {
  const { doc } = l;
  const reqs = c.requirements.length <= 8 ? c.requirements : c.requirements.filter((r) => r.fed).slice(0, 8);
  if (reqs.length === 0 || c.requirements.every((r) => r.supplierShare === null)) return;
  const labelW = 140;
  const cellW = Math.min(56, (CW - labelW) / reqs.length);
  const needed = 30 + 18 + c.tolerances.length * 15 + 14 * reqs.length;
  l.ensure(Math.min(needed, 260));
  text(doc, "Where each tolerance matters", ML, l.y, { size: 9, weight: "bold" });
  text(doc, "share of each requirement's spread (linearised), blank below 0.1 %", ML + CW - 260, l.y + 1, {
    size: 7,
    color: FAINT,
    width: 260,
    align: "right",
  });
  l.y += 15;
  const header = () => {
    box(doc, ML, l.y, labelW + cellW * reqs.length, 16, { fill: PAPER });
    text(doc, "SOURCE", ML + 4, l.y + 5, { size: 6.2, weight: "bold", color: MUTED });
    reqs.forEach((r, j) =>
      text(doc, `R${c.requirements.indexOf(r) + 1}`, ML + labelW + j * cellW, l.y + 5, {
        size: 6.5,
        weight: "bold",
        color: MUTED,
        width: cellW,
        align: "center",
      }),
    );
    l.y += 16;
  };
  header();
  const labelStyle = { size: 7.2, weight: "medium" as const, lineHeight: 9 };
  for (const t of c.tolerances) {
    const rh = Math.max(15, paragraph(doc, t.source, 0, 0, labelW - 8, labelStyle, false) + 6);
    if (l.y + rh > BOTTOM) {
      l.newPage();
      header();
    }
    paragraph(doc, t.source, ML + 4, l.y + 4, labelW - 8, labelStyle);
    reqs.forEach((r, j) => {
      const share = t.feeds.find((f) => f.metric === r.metric)?.share ?? 0;
      const cx = ML + labelW + j * cellW;
      if (share >= 0.001) {
        box(doc, cx + 2, l.y + 1.5, cellW - 4, 12, { fill: OURS, fillOpacity: Math.min(0.85, 0.1 + share * 1.6), radius: 1.5 });
        text(doc, formatShare(share), cx, l.y + 4, {
          size: 6.8,
          weight: share >= 0.25 ? "bold" : "regular",
          color: share >= 0.35 ? "#ffffff" : INK,
          width: cellW,
          align: "center",
        });
      }
    });
    l.y += rh;
    rule(doc, ML, l.y, ML + labelW + cellW * reqs.length, "#ebe7de", 0.4);
  }
  l.y += 6;
  for (const r of reqs) {
    const legend = `${r.description} (${r.metric})`;
    const h = paragraph(doc, legend, 0, 0, CW - 18, { size: 7, lineHeight: 9 }, false);
    l.ensure(h + 2);
    const i = c.requirements.indexOf(r) + 1;
    text(doc, `R${i}`, ML, l.y, { size: 7, weight: "bold", color: MUTED });
    paragraph(doc, legend, ML + 18, l.y, CW - 18, { size: 7, color: MUTED, lineHeight: 9 });
    l.y += h + 2;
  }
  l.y += 10;
}

export function requirementsTable(l: Layout, c: ReportContent) {
  const { doc } = l;
  const fedCount = c.requirements.filter((r) => r.fed).length;
  section(
    l,
    "Requirements your tolerances feed",
    `The system requirements of the study, with the yield the model predicts for them (95 % Wilson interval over ${formatCount(c.study.trials)} trials). ` +
      `"Your share" is the part of each requirement's spread that comes from your tolerances; ${fedCount} of ${c.requirements.length} take at least 1 % from them.`,
  );
  const cols: Col[] = [
    { key: "n", label: "", w: 22 },
    { key: "req", label: "Requirement", w: 176 },
    { key: "limit", label: "Limit", w: 44, align: "right" },
    { key: "target", label: "Target", w: 44, align: "right" },
    { key: "pred", label: "Predicted, 95 % CI", w: 86, align: "right" },
    { key: "ppm", label: "ppm out", w: 40, align: "right" },
    { key: "res", label: "Result", w: 40, align: "center" },
    { key: "share", label: "Yours", w: 47.28, align: "right" },
  ];
  l.ensure(60);
  l.y += tableHeader(doc, cols, ML, l.y);
  const descStyle = { size: 7.5, weight: "bold" as const, lineHeight: 9.5 };
  const metricStyle = { size: 6.5, color: FAINT, lineHeight: 8 };
  c.requirements.forEach((r, i) => {
    const dw = cols[1].w - 8;
    const rh = Math.max(
      28,
      paragraph(doc, r.description, 0, 0, dw, descStyle, false) + paragraph(doc, r.metric, 0, 0, dw, metricStyle, false) + 10,
    );
    if (l.y + rh > BOTTOM) {
      l.newPage();
      l.y += tableHeader(doc, cols, ML, l.y);
    }
    if (!r.fed) box(doc, ML, l.y, CW, rh, { fill: "#fcfbf8" });
    const y = l.y + 6;
    let x = ML;
    const cell = (k: number) => {
      const cx = x;
      x += cols[k].w;
      return cx + 4;
    };
    text(doc, `R${i + 1}`, cell(0), y, { size: 7.5, weight: "bold", color: r.fed ? OURS : FAINT });
    const rx = cell(1);
    const dh = paragraph(doc, r.description, rx, y, dw, { ...descStyle, color: r.fed ? INK : MUTED });
    paragraph(doc, r.metric, rx, y + dh, dw, metricStyle);
    text(doc, `≤ ${formatNumber(r.max, 3)}${r.unit === "%" ? " %" : "°"}`, cell(2), y, { size: 7.5, width: cols[2].w - 8, align: "right" });
    text(doc, formatFraction(r.yield), cell(3), y, { size: 7.5, width: cols[3].w - 8, align: "right" });
    const px = cell(4);
    text(doc, formatFraction(r.predictedYield), px, y, { size: 7.5, weight: "bold", width: cols[4].w - 8, align: "right" });
    text(doc, formatYieldRange(r.ci[0], r.ci[1]), px, y + 10, { size: 6.5, color: MUTED, width: cols[4].w - 8, align: "right" });
    text(doc, formatCount(r.ppmOut), cell(5), y, { size: 7.5, width: cols[5].w - 8, align: "right" });
    const resX = cell(6);
    const colour = r.passes ? COLOURS.pass : COLOURS.fail;
    const label = r.passes ? "PASS" : "FAIL";
    const pw = measure(doc, label, { size: 6.5, weight: "heavy" }) + 10;
    const pxx = resX - 4 + (cols[6].w - pw) / 2;
    box(doc, pxx, y - 1.5, pw, 12, { fill: colour, radius: 2 });
    text(doc, label, pxx + 5, y + 1, { size: 6.5, weight: "heavy", color: "#ffffff" });
    text(doc, formatShare(r.supplierShare), cell(7), y, {
      size: 7.5,
      weight: r.fed ? "bold" : "regular",
      color: r.fed ? OURS : MUTED,
      width: cols[7].w - 8,
      align: "right",
    });
    l.y += rh;
    rule(doc, ML, l.y, ML + CW, LINE, 0.5);
  });
  l.y += 14;
}

export function contributorsSection(l: Layout, c: ReportContent) {
  const { doc } = l;
  if (c.contributors.length === 0) return;
  section(
    l,
    "What drives each requirement",
    "Every tolerance source's share of the requirement's spread, from the model linearised at nominal (variance for signed metrics, mean square for magnitudes). Your tolerances are in colour.",
  );
  box(doc, ML, l.y, 10, 7, { fill: OURS, radius: 1 });
  text(doc, "your tolerances", ML + 14, l.y - 0.5, { size: 7, color: MUTED });
  box(doc, ML + 86, l.y, 10, 7, { fill: "#b9c0c9", radius: 1 });
  text(doc, "other sources", ML + 100, l.y - 0.5, { size: 7, color: MUTED });
  l.y += 16;
  for (const chart of c.contributors) {
    const h = contributorChartHeight(doc, chart, CW);
    l.ensure(h);
    contributorChart(doc, chart, ML, l.y, CW);
    l.y += h + 6;
  }
}

export function envelopeSection(l: Layout, c: ReportContent) {
  const { doc } = l;
  if (!c.envelope) return;
  section(
    l,
    "Heading error envelope",
    `Compass heading error of the whole stack (${c.envelope.accel} and ${c.envelope.mag}) against true heading, for each tilt of the sweep, at a field inclination of ${formatNumber(c.envelope.inclinationDeg, 4)}°. ` +
      "The shaded band (level) and the dashed lines (tilted) hold 90 % of units, 5th to 95th percentile; the solid lines are the medians.",
  );
  const h = 210;
  l.ensure(h + 24);
  l.y += envelopeChart(doc, c.envelope, c.headingLimit, ML, l.y, CW, h) + 12;
}

function kv(l: Layout, rows: Array<[string, string]>) {
  const { doc } = l;
  const labelW = 150;
  for (const [k, v] of rows) {
    const h = paragraph(doc, v, 0, 0, CW - labelW, { size: 8 }, false);
    l.ensure(h + 8);
    text(doc, k, ML, l.y + 4, { size: 7.5, weight: "bold", color: MUTED, width: labelW - 10 });
    paragraph(doc, v, ML + labelW, l.y + 4, CW - labelW, { size: 8 });
    l.y += h + 8;
    rule(doc, ML, l.y, ML + CW, "#ebe7de", 0.4);
  }
}

export function assumptions(l: Layout, c: ReportContent, meta: ReportMeta) {
  const s = c.study;
  section(
    l,
    "Assumptions of the study",
    "The predictions of this report hold for these settings. The same stack, settings, seed and engine give the same numbers.",
  );
  const site = s.site
    ? `${formatNumber(s.inclinationDeg, 4)}° (dip), from the ${s.site.model} at ${formatNumber(s.site.latitudeDeg, 4)}°, ${formatNumber(s.site.longitudeDeg, 4)}°, ${s.site.altitudeKm} km on ${s.site.date}`
    : `${formatNumber(s.inclinationDeg, 4)}° (dip), as entered`;
  const tilts = s.tilts.map((t) => (t.pitchDeg === 0 && t.rollDeg === 0 ? "level" : `pitch ${t.pitchDeg}°, roll ${t.rollDeg}°`)).join("; ");
  kv(l, [
    ["Field inclination", site],
    [
      "Calibration",
      s.calibration.after === "none"
        ? "none: every deviation reaches the product"
        : `after the ${s.calibration.after} stage, residual ${s.calibration.residual ?? "none"}`,
    ],
    [
      "Trials and seed",
      `${formatCount(s.trials)} Monte Carlo trials (${s.sampling === "lhs" ? "Latin hypercube" : "random"} sampling), seed ${s.seed}`,
    ],
    ["Heading sweep", `every ${s.headingStepDeg}° of heading at each tilt: ${tilts}`],
    [
      "Stack",
      `revision ${c.revision.number}${c.revision.name ? `, ${c.revision.name}` : ""}, approved ${fmtDate(c.revision.approvedAt)}; ${c.stack.length} elements`,
    ],
    ["Engine", s.engine || "—"],
    ["Built", `${fmtDateTime(c.builtAt)} from study ${s.number}, finished ${fmtDateTime(s.finishedAt)}`],
    ...(meta.note ? ([["Note from the engineer", meta.note]] as Array<[string, string]>) : []),
  ]);
  l.y += 12;
}
