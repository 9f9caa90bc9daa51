/**
 * The supplier's report as a PDF (A4): a cover with the facts and a picture of the stack,
 * the supplier's tolerances with the capability asked, the requirements they feed, the
 * contributor charts, the heading envelope, the study's assumptions and the cautions.
 */
import type { ReportContent } from "@shared/schemas/reports";
import { contributorChart, contributorChartHeight, envelopeChart, OURS, sideView } from "./report-charts";
import { box, COLOURS, createDoc, FAINT, finish, INK, LINE, measure, MUTED, PAPER, paragraph, rule, text, type Doc } from "./pdf-draw";
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
import { fmtDate, fmtDateTime } from "./report-format";
import { distLabel } from "@shared/reports/format";

export type ReportMeta = {
  code: string;
  revision: number;
  status: "draft" | "released";
  createdAt: string;
  createdByName: string | null;
  releasedAt: string | null;
  releasedByName: string | null;
  link: string;
  note: string;
  snapshot: Buffer | null;
};

const W = 595.28;
const H = 841.89;
const ML = 48;
const CW = W - 2 * ML;
const TOP = 74;
const BOTTOM = 782;

class Layout {
  y = 0;
  constructor(readonly doc: Doc) {}
  ensure(h: number) {
    if (this.y + h > BOTTOM) this.newPage();
  }
  newPage() {
    this.doc.addPage();
    this.y = TOP;
  }
}

function brandStrip(doc: Doc, y: number, h: number) {
  const colours = [COLOURS.gyro, COLOURS.accel, COLOURS.mag, COLOURS.asic, COLOURS.substrate, COLOURS.board];
  const seg = W / colours.length;
  colours.forEach((c, i) => box(doc, i * seg, y, seg + 0.5, h, { fill: c }));
}

function pill(doc: Doc, label: string, x: number, y: number, colour: string, align: "left" | "right" = "left") {
  const style = { size: 7, weight: "heavy" as const };
  const w = measure(doc, label, style) + 14;
  const bx = align === "right" ? x - w : x;
  box(doc, bx, y, w, 15, { fill: colour, radius: 7.5, fillOpacity: 0.1 });
  box(doc, bx, y, w, 15, { stroke: colour, radius: 7.5, lineWidth: 0.8 });
  text(doc, label, bx + 7, y + 4, { ...style, color: colour });
  return w;
}

function section(l: Layout, num: string, title: string, lead?: string) {
  const { doc } = l;
  const leadH = lead ? paragraph(doc, lead, ML, 0, CW, { size: 8.3, color: MUTED }, false) : 0;
  l.ensure(44 + leadH + 60);
  l.y += 6;
  text(doc, num, ML, l.y, { size: 12.5, weight: "heavy", color: OURS });
  text(doc, title, ML + 20, l.y, { size: 12.5, weight: "heavy" });
  l.y += 20;
  rule(doc, ML, l.y, ML + CW, INK, 0.8);
  l.y += 8;
  if (lead) {
    paragraph(doc, lead, ML, l.y, CW, { size: 8.3, color: MUTED });
    l.y += leadH + 6;
  }
}

type Col = { key: string; label: string; w: number; align?: "left" | "right" | "center" };

/** Capitals for Latin letters only: σ stays σ (Σ would be another symbol). */
const caps = (s: string) => s.replace(/[a-z]/g, (ch) => ch.toUpperCase());

function tableHeader(doc: Doc, cols: Col[], x: number, y: number) {
  box(
    doc,
    x,
    y,
    cols.reduce((a, c) => a + c.w, 0),
    18,
    { fill: PAPER },
  );
  let cx = x;
  for (const c of cols) {
    text(doc, caps(c.label), cx + 4, y + 6, { size: 6.2, weight: "bold", color: MUTED, width: c.w - 8, align: c.align ?? "left" });
    cx += c.w;
  }
  rule(doc, x, y + 18, x + cols.reduce((a, c) => a + c.w, 0), "#bdb6a6", 0.7);
  return 18;
}

function cover(l: Layout, c: ReportContent, meta: ReportMeta) {
  const { doc } = l;
  brandStrip(doc, 0, 5);
  text(doc, "ORTHOSTACK", ML, 30, { size: 8.5, weight: "heavy", tracking: 2.2 });
  text(doc, "Supplier tolerance report", ML + 86, 30, { size: 8.5, color: MUTED });
  pill(
    doc,
    meta.status === "released" ? "RELEASED" : "DRAFT · NOT RELEASED",
    ML + CW,
    27,
    meta.status === "released" ? COLOURS.pass : COLOURS.fail,
    "right",
  );

  let y = 78;
  text(doc, `${meta.code}  ·  REVISION ${meta.revision}`, ML, y, { size: 8.5, weight: "bold", color: OURS });
  y += 16;
  text(doc, c.supplier.name, ML, y, { size: 27, weight: "heavy", width: CW });
  y += 36;
  y += paragraph(doc, `Tolerances to hold for ${c.project.name}`, ML, y, CW, { size: 12.5, color: INK, weight: "medium" });
  y += 10;

  // facts: two columns of label and value
  const facts: Array<[string, string]> = [
    ["Project", c.project.name],
    ["Stack revision", `${c.revision.number}${c.revision.name ? ` — ${c.revision.name}` : ""}`],
    [
      "Approved",
      c.revision.approvedAt
        ? `${fmtDate(c.revision.approvedAt)}${c.revision.approvedByName ? ` by ${c.revision.approvedByName}` : ""}`
        : "—",
    ],
    ["Study", `${c.study.number}${c.study.label ? ` — ${c.study.label}` : ""}`],
    ["Trials and seed", `${formatCount(c.study.trials)} trials, seed ${c.study.seed}`],
    ["Report", `${meta.code}, revision ${meta.revision}`],
    [
      "Status",
      meta.status === "released"
        ? `Released ${fmtDate(meta.releasedAt)}${meta.releasedByName ? ` by ${meta.releasedByName}` : ""}`
        : "Draft: not released, not for production",
    ],
    ["Date", fmtDate(meta.status === "released" ? meta.releasedAt : meta.createdAt)],
    ["Prepared by", meta.createdByName ?? "—"],
    [
      "Capability asked",
      `Cpk ≥ ${formatIndex(c.capability.cpk)}${Object.keys(c.capability.overrides).length ? " (some tolerances differ)" : ""}`,
    ],
  ];
  const colW = CW / 2;
  const rows = Math.ceil(facts.length / 2);
  rule(doc, ML, y, ML + CW, INK, 0.8);
  for (let i = 0; i < rows; i++) {
    for (let j = 0; j < 2; j++) {
      const f = facts[j * rows + i];
      if (!f) continue;
      const fx = ML + j * colW;
      text(doc, f[0].toUpperCase(), fx, y + 7, { size: 6.2, weight: "bold", color: FAINT });
      text(doc, f[1], fx, y + 16, { size: 8.6, weight: "medium", width: colW - 14 });
    }
    y += 30;
    rule(doc, ML, y, ML + CW, LINE);
  }
  y += 14;

  // tiles
  const fed = c.requirements.filter((r) => r.fed);
  const passing = c.requirements.filter((r) => r.passes).length;
  const tiles: Array<[string, string, string]> = [
    [String(c.tolerances.length), c.tolerances.length === 1 ? "tolerance assigned to you" : "tolerances assigned to you", INK],
    [`${fed.length} of ${c.requirements.length}`, "requirements your tolerances feed", INK],
    [
      `${passing} of ${c.requirements.length}`,
      "requirements predicted to pass",
      passing === c.requirements.length ? COLOURS.pass : COLOURS.fail,
    ],
    [formatIndex(c.capability.cpk), "Cpk asked of your process", OURS],
  ];
  const tw = (CW - 3 * 8) / 4;
  tiles.forEach(([big, small, colour], i) => {
    const tx = ML + i * (tw + 8);
    box(doc, tx, y, tw, 52, { fill: PAPER, radius: 3 });
    box(doc, tx, y, 3, 52, { fill: colour });
    text(doc, big, tx + 12, y + 9, { size: 17, weight: "heavy", color: colour });
    paragraph(doc, small, tx + 12, y + 31, tw - 18, { size: 6.8, color: MUTED, lineHeight: 8.4 });
  });
  y += 64;

  // the stack: the engineer's 3D snapshot, or our schematic side view
  const figH = 250;
  text(doc, meta.snapshot ? "The stack, from the 3D view" : "The stack in side view (schematic)", ML, y, { size: 8, weight: "bold" });
  if (!meta.snapshot)
    text(doc, "your elements outlined, your sources named", ML + CW - 220, y, { size: 7, color: FAINT, width: 220, align: "right" });
  y += 13;
  if (meta.snapshot) {
    box(doc, ML, y, CW, figH, { fill: "#1d2731", radius: 3 });
    try {
      doc.image(meta.snapshot, ML + 4, y + 4, { fit: [CW - 8, figH - 8], align: "center", valign: "center" });
    } catch {
      sideView(doc, c.stack, ML, y, CW, figH);
    }
  } else {
    sideView(doc, c.stack, ML, y, CW, figH);
  }
  y += figH + 14;

  // cautions, on the cover as well as at the end
  const cautionText = c.cautions.join(" ");
  const ch = paragraph(doc, cautionText, ML + 16, 0, CW - 28, { size: 8, color: INK }, false);
  box(doc, ML, y, CW, ch + 30, { fill: "#fbf1ee", radius: 3 });
  box(doc, ML, y, 3, ch + 30, { fill: COLOURS.fail });
  text(doc, "READ BEFORE USE", ML + 16, y + 9, { size: 6.8, weight: "heavy", color: COLOURS.fail });
  paragraph(doc, cautionText, ML + 16, y + 21, CW - 28, { size: 8, color: INK });
}

function toleranceTable(l: Layout, c: ReportContent) {
  const { doc } = l;
  section(
    l,
    "1",
    "Tolerances you hold",
    `Each row is a tolerance source of stack revision ${c.revision.number} whose owner is ${c.supplier.name}. The window is the target ± the tolerance. ` +
      `The capability asked applies to the process that makes it, measured on production parts: Cpk = min(USL − x̄, x̄ − LSL) / 3s. ` +
      `σ max is the largest standard deviation of a process centred on the target that meets it; σ modelled is the spread the study sampled.`,
  );
  const cols: Col[] = [
    { key: "source", label: "Source", w: 80 },
    { key: "element", label: "Element", w: 46 },
    { key: "quantity", label: "Quantity", w: 100 },
    { key: "tol", label: "Tolerance", w: 50, align: "right" },
    { key: "dist", label: "Distribution", w: 62 },
    { key: "stage", label: "Stage", w: 40 },
    { key: "cpk", label: "Cpk ≥", w: 32, align: "right" },
    { key: "smax", label: "σ max", w: 46, align: "right" },
    { key: "smod", label: "σ model", w: 43.28, align: "right" },
  ];
  l.ensure(40);
  l.y += tableHeader(doc, cols, ML, l.y);
  let anyRaised = false;
  c.tolerances.forEach((t, i) => {
    const qh = paragraph(doc, t.quantity, 0, 0, cols[2].w - 8, { size: 7, lineHeight: 9 }, false);
    const rh = Math.max(20, qh + 10, t.mean ? 26 : 0);
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
    text(doc, t.source, cell(0), y, { size: 7.5, weight: "bold", width: cols[0].w - 8 });
    text(doc, t.elementName, cell(1), y, { size: 7.5, width: cols[1].w - 8 });
    paragraph(doc, t.quantity, cell(2), y, cols[2].w - 8, { size: 7, lineHeight: 9, color: MUTED });
    const tx = cell(3);
    text(doc, formatWritten(t.tol, t.unit, "±"), tx, y, { size: 7.5, weight: "bold", width: cols[3].w - 8, align: "right" });
    if (t.mean)
      text(doc, `target ${t.mean > 0 ? "+" : ""}${formatWritten(t.mean, t.unit)}`, tx - 20, y + 10, {
        size: 6.2,
        color: MUTED,
        width: cols[3].w + 12,
        align: "right",
      });
    text(doc, distLabel(t.dist, t.sigmas), cell(4), y, { size: 7.5, width: cols[4].w - 8 });
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

function shareMatrix(l: Layout, c: ReportContent) {
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
  for (const t of c.tolerances) {
    if (l.y + 15 > BOTTOM) {
      l.newPage();
      header();
    }
    text(doc, t.source, ML + 4, l.y + 4, { size: 7.2, weight: "medium", width: labelW - 8 });
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
    l.y += 15;
    rule(doc, ML, l.y, ML + labelW + cellW * reqs.length, "#ebe7de", 0.4);
  }
  l.y += 6;
  for (const r of reqs) {
    l.ensure(12);
    const i = c.requirements.indexOf(r) + 1;
    text(doc, `R${i}`, ML, l.y, { size: 7, weight: "bold", color: MUTED });
    text(doc, `${r.description} (${r.metric})`, ML + 18, l.y, { size: 7, color: MUTED, width: CW - 18 });
    l.y += 11;
  }
  l.y += 10;
}

function requirementsTable(l: Layout, c: ReportContent) {
  const { doc } = l;
  const fedCount = c.requirements.filter((r) => r.fed).length;
  section(
    l,
    "2",
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
  c.requirements.forEach((r, i) => {
    const rh = 28;
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
    text(doc, r.description, rx, y, { size: 7.5, weight: "bold", width: cols[1].w - 8, color: r.fed ? INK : MUTED });
    text(doc, r.metric, rx, y + 10, { size: 6.5, color: FAINT, width: cols[1].w - 8 });
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

function contributorsSection(l: Layout, c: ReportContent) {
  const { doc } = l;
  if (c.contributors.length === 0) return;
  section(
    l,
    "3",
    "What drives each requirement",
    "Every tolerance source's share of the requirement's spread, from the model linearised at nominal (variance for signed metrics, mean square for magnitudes). Your tolerances are in colour.",
  );
  box(doc, ML, l.y, 10, 7, { fill: OURS, radius: 1 });
  text(doc, "your tolerances", ML + 14, l.y - 0.5, { size: 7, color: MUTED });
  box(doc, ML + 86, l.y, 10, 7, { fill: "#b9c0c9", radius: 1 });
  text(doc, "other sources", ML + 100, l.y - 0.5, { size: 7, color: MUTED });
  l.y += 16;
  for (const chart of c.contributors) {
    const h = contributorChartHeight(chart);
    l.ensure(h);
    contributorChart(doc, chart, ML, l.y, CW);
    l.y += h + 6;
  }
}

function envelopeSection(l: Layout, c: ReportContent) {
  const { doc } = l;
  if (!c.envelope) return;
  section(
    l,
    "4",
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

function assumptions(l: Layout, c: ReportContent, meta: ReportMeta) {
  const s = c.study;
  section(
    l,
    c.envelope ? "5" : "4",
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

function closing(l: Layout, c: ReportContent, meta: ReportMeta) {
  const { doc } = l;
  const cautionH = c.cautions.reduce((a, t) => a + paragraph(doc, t, 0, 0, CW - 28, { size: 8.5 }, false) + 6, 0);
  l.ensure(cautionH + 110);
  section(l, c.envelope ? "6" : "5", "Cautions");
  const y0 = l.y;
  box(doc, ML, y0, CW, cautionH + 18, { fill: "#fbf1ee", radius: 3 });
  box(doc, ML, y0, 3, cautionH + 18, { fill: COLOURS.fail });
  let y = y0 + 10;
  for (const t of c.cautions) y += paragraph(doc, t, ML + 16, y, CW - 28, { size: 8.5 }) + 6;
  l.y = y0 + cautionH + 32;
  text(doc, "Acknowledging this report", ML, l.y, { size: 9, weight: "bold" });
  l.y += 14;
  l.y += paragraph(
    doc,
    `Open the report at ${meta.link} and acknowledge it there, or ask a question as a comment. The acknowledgement is recorded with your name and the time, against ${meta.code} revision ${meta.revision}.`,
    ML,
    l.y,
    CW,
    { size: 8, color: MUTED },
  );
}

function decoratePages(doc: Doc, meta: ReportMeta, c: ReportContent) {
  const range = doc.bufferedPageRange();
  const total = range.count;
  for (let i = range.start; i < range.start + total; i++) {
    doc.switchToPage(i);
    if (i > range.start) {
      brandStrip(doc, 0, 3);
      text(doc, "ORTHOSTACK", ML, 30, { size: 7, weight: "heavy", tracking: 1.8 });
      text(doc, `${meta.code} revision ${meta.revision}  ·  ${c.supplier.name}  ·  ${c.project.name}`, ML + 80, 30, {
        size: 7,
        color: MUTED,
        width: CW - 80 - 100,
      });
      pill(
        doc,
        meta.status === "released" ? "RELEASED" : "DRAFT",
        ML + CW,
        26,
        meta.status === "released" ? COLOURS.pass : COLOURS.fail,
        "right",
      );
      rule(doc, ML, 48, ML + CW, LINE);
    }
    if (meta.status === "draft") {
      doc.save();
      doc.rotate(-35, { origin: [W / 2, H / 2] });
      text(doc, "DRAFT", W / 2 - 300, H / 2 - 50, {
        size: 110,
        weight: "heavy",
        color: COLOURS.fail,
        opacity: 0.06,
        width: 600,
        align: "center",
      });
      doc.restore();
    }
    rule(doc, ML, 800, ML + CW, LINE);
    text(doc, "Predictions from a model of the tolerances entered; they do not replace qualification of built parts.", ML, 807, {
      size: 6.5,
      color: FAINT,
      width: CW - 90,
    });
    text(doc, `Page ${i - range.start + 1} of ${total}`, ML + CW - 90, 807, { size: 6.5, color: MUTED, width: 90, align: "right" });
  }
}

export async function renderReportPdf(c: ReportContent, meta: ReportMeta): Promise<Buffer> {
  const date = new Date(meta.releasedAt ?? c.builtAt);
  const doc = createDoc({
    title: `${meta.code} revision ${meta.revision}: ${c.supplier.name}`,
    subject: `Supplier tolerance report for ${c.project.name}`,
    date,
  });
  const l = new Layout(doc);
  cover(l, c, meta);
  l.newPage();
  toleranceTable(l, c);
  shareMatrix(l, c);
  requirementsTable(l, c);
  contributorsSection(l, c);
  envelopeSection(l, c);
  assumptions(l, c, meta);
  closing(l, c, meta);
  decoratePages(doc, meta, c);
  return finish(doc);
}
