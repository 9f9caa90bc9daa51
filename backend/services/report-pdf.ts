/**
 * The supplier's report as a PDF (A4): a cover with the facts and a picture of the stack,
 * the supplier's tolerances with their nominals, datums and the capability asked, a dimensioned
 * drawing of the stack and a measurement plan, the requirements they feed, the
 * contributor charts, the heading envelope, the study's assumptions and the cautions.
 */
import type { ReportContent } from "@shared/schemas/reports";
import { formatCount, formatFraction, formatIndex } from "@shared/format";
import { OURS, sideView } from "./report-charts";
import { box, COLOURS, createDoc, FAINT, finish, INK, LINE, MUTED, PAPER, paragraph, rule, text, type Doc } from "./pdf-draw";
import { fmtDate } from "./report-format";
import { brandStrip, CW, H, Layout, ML, pill, section, W } from "./report-pdf-layout";
import { assumptions, contributorsSection, envelopeSection, requirementsTable, shareMatrix, toleranceTable } from "./report-pdf-tables";
import { drawingSection, measurementPlan } from "./report-pdf-drawing";

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
  y += paragraph(doc, c.supplier.name, ML, y, CW, { size: 27, weight: "heavy", lineHeight: 32 }) + 4;
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
  const valueStyle = { size: 8.6, weight: "medium" as const, lineHeight: 10.5 };
  for (let i = 0; i < rows; i++) {
    let rowH = 30;
    for (let j = 0; j < 2; j++) {
      const f = facts[j * rows + i];
      if (!f) continue;
      const fx = ML + j * colW;
      text(doc, f[0].toUpperCase(), fx, y + 7, { size: 6.2, weight: "bold", color: FAINT });
      rowH = Math.max(rowH, 19 + paragraph(doc, f[1], fx, y + 16, colW - 14, valueStyle));
    }
    y += rowH;
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

  // a study that misses a target says so before anything else is read
  const missed = c.requirements.filter((r) => !r.passes);
  if (missed.length) {
    const list = missed
      .map(
        (r) =>
          `R${c.requirements.indexOf(r) + 1} ${r.description}: ${formatFraction(r.predictedYield)} predicted against ${formatFraction(r.yield)}`,
      )
      .join("; ");
    const missText = `Study ${c.study.number} misses ${missed.length} of ${c.requirements.length} targets: ${list}. The engineer chose to report from it; ask before setting up production against these tolerances.`;
    const mh = paragraph(doc, missText, 0, 0, CW - 28, { size: 7.6 }, false);
    box(doc, ML, y, CW, mh + 26, { fill: "#fbf1ee", radius: 3 });
    box(doc, ML, y, 3, mh + 26, { fill: COLOURS.fail });
    text(doc, "TARGETS MISSED", ML + 16, y + 7, { size: 6.8, weight: "heavy", color: COLOURS.fail });
    paragraph(doc, missText, ML + 16, y + 18, CW - 28, { size: 7.6 });
    y += mh + 34;
  }

  // the stack: the engineer's 3D snapshot, or our schematic side view
  const cautionText = c.cautions.join(" ");
  const ch = paragraph(doc, cautionText, ML + 16, 0, CW - 28, { size: 8, color: INK }, false);
  const figH = Math.max(110, Math.min(250, 792 - (y + 13 + 14 + ch + 30)));
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
  box(doc, ML, y, CW, ch + 30, { fill: "#fbf1ee", radius: 3 });
  box(doc, ML, y, 3, ch + 30, { fill: COLOURS.fail });
  text(doc, "READ BEFORE USE", ML + 16, y + 9, { size: 6.8, weight: "heavy", color: COLOURS.fail });
  paragraph(doc, cautionText, ML + 16, y + 21, CW - 28, { size: 8, color: INK });
}

function closing(l: Layout, c: ReportContent, meta: ReportMeta) {
  const { doc } = l;
  const cautionH = c.cautions.reduce((a, t) => a + paragraph(doc, t, 0, 0, CW - 28, { size: 8.5 }, false) + 6, 0);
  l.ensure(cautionH + 110);
  section(l, "Cautions");
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
      // names wrap onto a second line rather than being cut
      const running = `${meta.code} revision ${meta.revision}  ·  ${c.supplier.name}  ·  ${c.project.name}`;
      const twoLines = paragraph(doc, running, 0, 0, CW - 80 - 100, { size: 7, lineHeight: 8.5 }, false) > 8.5;
      paragraph(doc, running, ML + 80, twoLines ? 24 : 30, CW - 80 - 100, { size: twoLines ? 6.5 : 7, color: MUTED, lineHeight: 8.5 });
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
  drawingSection(l, c);
  measurementPlan(l, c, meta);
  requirementsTable(l, c);
  contributorsSection(l, c);
  envelopeSection(l, c);
  assumptions(l, c, meta);
  closing(l, c, meta);
  decoratePages(doc, meta, c);
  return finish(doc);
}
