/**
 * The report's dimensioned drawing, generated from the stack frozen in the report: a top view
 * of the footprints with their positions and a side section with thicknesses and bond lines,
 * both vector and to a stated scale; the table of nominal dimensions; and the measurement plan
 * that tells the supplier what to measure, on how many units, and how to send it back.
 */
import type { ReportContent } from "@shared/schemas/reports";
import { formatFixed } from "@shared/format";
import { DRAWING_COLOUR } from "@shared/palette";
import {
  drawingScale as sharedDrawingScale,
  DRAWING_WORDS,
  placeBalloons,
  placeStack,
  PT_PER_MM,
  scaleBarStepMm,
  sideSection,
  topView,
  topViewExtent,
  type SideSection,
  type TopView,
} from "@shared/stack-drawing";
import { describeSupports, positionReference, REPORT_RESOLUTION, sourceNominal } from "@shared/reports/nominals";
import { MEASUREMENT_SAMPLE, measurementSteps } from "@shared/reports/measurement-plan";
import { box, COLOURS, FAINT, INK, LINE, MUTED, paragraph, rule, text, type Doc } from "./pdf-draw";
import { OURS } from "./report-charts";
import { BOTTOM, CW, ML, section, tableHeader, type Col, type Layout } from "./report-pdf-layout";
import type { ReportMeta } from "./report-pdf";

type El = ReportContent["stack"][number];

const mm = (v: number) => formatFixed(v, REPORT_RESOLUTION.mm);
const um = (v: number) => formatFixed(v, REPORT_RESOLUTION.um);
const deg = (v: number) => formatFixed(v, REPORT_RESOLUTION.deg);

export { placeStack };

/** The largest drafting scale at which `extentMm` fits in `roomPt` points. */
export function drawingScale(extentMm: number, roomPt: number): number {
  return sharedDrawingScale(extentMm, roomPt, PT_PER_MM);
}

function arrowHead(doc: Doc, x: number, y: number, dx: number, dy: number) {
  const len = Math.hypot(dx, dy) || 1;
  const ux = dx / len;
  const uy = dy / len;
  doc
    .save()
    .moveTo(x, y)
    .lineTo(x - ux * 4 - uy * 1.6, y - uy * 4 + ux * 1.6)
    .lineTo(x - ux * 4 + uy * 1.6, y - uy * 4 - ux * 1.6)
    .closePath()
    .fill(INK)
    .restore();
}

/** A dimension line between two points with arrows at both ends and its value beside it. */
function dimension(doc: Doc, x1: number, y1: number, x2: number, y2: number, label: string, side: "above" | "left" | "right") {
  doc.save().moveTo(x1, y1).lineTo(x2, y2).lineWidth(0.5).strokeColor(INK).stroke().restore();
  arrowHead(doc, x1, y1, x1 - x2, y1 - y2);
  arrowHead(doc, x2, y2, x2 - x1, y2 - y1);
  const mx = (x1 + x2) / 2;
  const my = (y1 + y2) / 2;
  if (side === "above") text(doc, label, mx - 40, my - 10, { size: 6.8, width: 80, align: "center" });
  else if (side === "left") text(doc, label, mx - 64, my - 3.5, { size: 6.8, width: 60, align: "right" });
  else text(doc, label, mx + 4, my - 3.5, { size: 6.8 });
}

function scaleBar(doc: Doc, x: number, y: number, scale: number, label: string) {
  const k = scale * PT_PER_MM;
  const stepMm = scaleBarStepMm(scale);
  const len = stepMm * k;
  doc
    .save()
    .moveTo(x, y)
    .lineTo(x + len, y)
    .lineWidth(1.2)
    .strokeColor(INK)
    .stroke()
    .restore();
  for (const t of [0, len])
    doc
      .save()
      .moveTo(x + t, y - 3)
      .lineTo(x + t, y + 3)
      .lineWidth(0.6)
      .strokeColor(INK)
      .stroke()
      .restore();
  text(doc, `${stepMm} mm`, x + len + 4, y - 3.5, { size: 6.5, color: MUTED });
  text(doc, `${label}  ·  scale ${scale}:1 on A4 printed at 100 %`, x, y + 6, { size: 7, weight: "bold" });
}

function drawTopView(doc: Doc, view: TopView<El>, x: number, y: number, w: number, h: number, scale: number) {
  const { minX, maxX, minY, maxY } = view.bounds;
  const k = scale * PT_PER_MM;
  const ox = x + w / 2 - ((minX + maxX) / 2) * k;
  const oy = y + h / 2 + ((minY + maxY) / 2) * k;
  const X = (v: number) => ox + v * k;
  const Y = (v: number) => oy - v * k;
  box(doc, x, y, w, h, { fill: DRAWING_COLOUR.sheet, stroke: LINE, radius: 3 });
  const balloons = placeBalloons(
    view.items.map((it) => [X(it.balloonAt[0]), Y(it.balloonAt[1])]),
    11,
    8,
  );
  view.items.forEach(({ p, corners: c, balloonAt: corner, number }, i) => {
    const colour = (COLOURS as Record<string, string>)[p.e.kind] ?? MUTED;
    doc.save();
    doc.polygon(...c.map(([px, py]) => [X(px), Y(py)] as [number, number]));
    doc.fillOpacity(0.08).lineWidth(p.e.sources.length ? 1.3 : 0.6);
    doc.fillAndStroke(colour, p.e.sources.length ? OURS : colour);
    doc.restore();
    // centre mark
    const mx = X(p.cx);
    const my = Y(p.cy);
    doc
      .save()
      .moveTo(mx - 3, my)
      .lineTo(mx + 3, my)
      .moveTo(mx, my - 3)
      .lineTo(mx, my + 3)
      .lineWidth(0.5)
      .strokeColor(colour)
      .stroke()
      .restore();
    // balloon at the footprint's top-right corner, keyed to the table of positions
    const [bx, by] = balloons[i];
    doc.save().moveTo(X(corner[0]), Y(corner[1])).lineTo(bx, by).lineWidth(0.4).strokeColor(colour).stroke().restore();
    doc.save().circle(bx, by, 5.2).fillAndStroke("#ffffff", colour).restore();
    text(doc, String(number), bx - 5, by - 3, { size: 6, weight: "bold", width: 10, align: "center" });
  });
  // overall size of the outermost part on the board (the package footprint)
  if (view.dimensions) {
    const { x: dx, y: dy } = view.dimensions;
    const below = Y(dx.from[1]) + 12;
    if (below < y + h - 4) dimension(doc, X(dx.from[0]), below, X(dx.to[0]), below, dx.label, "above");
    const left = X(dy.from[0]) - 12;
    if (left > x + 4) dimension(doc, left, Y(dy.from[1]), left, Y(dy.to[1]), dy.label, "left");
  }
  // board axes at the lower left
  const ax = x + 12;
  const ay = y + h - 12;
  doc
    .save()
    .moveTo(ax, ay)
    .lineTo(ax + 22, ay)
    .moveTo(ax, ay)
    .lineTo(ax, ay - 22)
    .lineWidth(0.6)
    .strokeColor(MUTED)
    .stroke()
    .restore();
  arrowHead(doc, ax + 22, ay, 1, 0);
  arrowHead(doc, ax, ay - 22, 0, -1);
  text(doc, "x", ax + 25, ay - 4, { size: 6.5, color: MUTED });
  text(doc, "y", ax - 2, ay - 31, { size: 6.5, color: MUTED });
}

const LABEL_HEAD = { size: 7, weight: "bold" as const, lineHeight: 8.6 };
const LABEL_BODY = { size: 6.5, color: MUTED, lineHeight: 8 };

/** The height each side-section label takes, top element first. */
function labelHeights(doc: Doc, side: SideSection<El>, width: number): number[] {
  return side.labels.map(
    (s) => paragraph(doc, s.head, 0, 0, width, LABEL_HEAD, false) + paragraph(doc, s.body, 0, 0, width, LABEL_BODY, false) + 4,
  );
}

function drawSideSection(doc: Doc, side: SideSection<El>, x: number, y: number, w: number, h: number, scale: number, labelX: number) {
  const { minX, maxX } = side;
  const k = scale * PT_PER_MM;
  const ox = x + (labelX - x) / 2 - ((minX + maxX) / 2) * k;
  const base = y + h - 14;
  const X = (v: number) => ox + v * k;
  const Z = (v: number) => base - v * k;
  box(doc, x, y, w, h, { fill: DRAWING_COLOUR.sheet, stroke: LINE, radius: 3 });
  // the board's top face is z = 0
  box(doc, x + 6, base, labelX - x - 12, 8, { fill: COLOURS.board, fillOpacity: 0.25 });
  rule(doc, x + 6, base, labelX - 6, INK, 0.7);
  for (const { p, x0: left, x1: right } of side.items) {
    const colour = (COLOURS as Record<string, string>)[p.e.kind] ?? MUTED;
    const x0 = X(left);
    const x1 = X(right);
    if (p.z0 > p.bond0)
      box(doc, x0, Z(p.z0), x1 - x0, Math.max(0.3, (p.z0 - p.bond0) * k), { fill: DRAWING_COLOUR.bondLine, fillOpacity: 0.9 });
    box(doc, x0, Z(p.z1), x1 - x0, p.e.size.z * k, {
      fill: colour,
      fillOpacity: 0.3,
      stroke: p.e.sources.length ? OURS : colour,
      lineWidth: 0.6,
    });
  }
  // overall height beside the stack
  const dx = X(minX) - 14;
  if (side.height) dimension(doc, dx, Z(side.height.from[1]), dx, Z(side.height.to[1]), side.height.label, "left");
  // labels from the top element down, each with a leader to its right edge
  let ly = y + 6;
  const heights = labelHeights(doc, side, x + w - labelX - 6);
  side.labels.forEach((s, i) => {
    const ex = X(s.x1);
    const ez = Z((s.p.z0 + s.p.z1) / 2);
    doc
      .save()
      .moveTo(ex, ez)
      .lineTo(labelX - 4, ly + 4)
      .lineWidth(0.35)
      .strokeColor(FAINT)
      .stroke()
      .restore();
    const h1 = paragraph(doc, s.head, labelX, ly, x + w - labelX - 6, LABEL_HEAD);
    paragraph(doc, s.body, labelX, ly + h1, x + w - labelX - 6, LABEL_BODY);
    ly += heights[i];
  });
  const by = ly + 2;
  box(doc, labelX, by + 1, 10, 4, { fill: DRAWING_COLOUR.bondLine });
  text(doc, DRAWING_WORDS.bondLine, labelX + 14, by - 1, { size: 6.5, color: MUTED });
  text(doc, DRAWING_WORDS.heights, labelX, by + 9, { size: 6.5, color: MUTED });
}

export function drawingSection(l: Layout, c: ReportContent) {
  const { doc } = l;
  const placed = placeStack(c.stack);
  if (!placed.some((p) => p.depth > 0)) return;
  if (l.y > 200) l.newPage();
  section(
    l,
    "Dimensions of the stack",
    `Drawn from stack revision ${c.revision.number} at its nominal dimensions, to the scale stated under each view (vector: zoom in for detail). ` +
      `Dimensions in mm, bond lines in µm. A position is that of an element's centre from the centre of its parent's top face, along the parent's x and y; yaw turns the element about its centre from the parent's x axis. ` +
      `Your elements are outlined in colour.`,
  );
  const viewW = 300;
  const topH = 250;
  const top = topView(placed);
  const topScale = drawingScale(topViewExtent(top, topH / viewW), topH - 50);
  drawTopView(doc, top, ML, l.y, viewW, topH, topScale);

  // positions beside the top view, keyed by the balloons
  let ty = l.y + 2;
  const tx = ML + viewW + 12;
  const tw = CW - viewW - 12;
  text(doc, "POSITIONS ON THE PARENT", tx, ty, { size: 6.2, weight: "bold", color: MUTED });
  ty += 11;
  for (const it of top.items) {
    ty += paragraph(doc, it.head, tx, ty, tw, { size: 7.2, weight: "bold", lineHeight: 9 });
    ty += paragraph(doc, it.body, tx + 9, ty, tw - 9, { size: 6.8, color: MUTED, lineHeight: 8.5 }) + 4;
  }
  l.y += topH + 4;
  scaleBar(doc, ML + 4, l.y + 6, topScale, DRAWING_WORDS.topView);
  l.y += 26;

  const side = sideSection(placed);
  const labelX = ML + CW - 190;
  const sideH = Math.max(150, labelHeights(doc, side, 184).reduce((a, h) => a + h, 0) + 34);
  const sideScale = Math.min(drawingScale(side.maxX - side.minX, labelX - ML - 90), drawingScale(side.top, sideH - 30));
  l.ensure(sideH + 30);
  drawSideSection(doc, side, ML, l.y, CW, sideH, sideScale, labelX);
  l.y += sideH + 4;
  scaleBar(doc, ML + 4, l.y + 6, sideScale, DRAWING_WORDS.sideSection);
  l.y += 30;
  elementTable(l, c);
}

function elementTable(l: Layout, c: ReportContent) {
  const { doc } = l;
  const cols: Col[] = [
    { key: "el", label: "Element", w: 74 },
    { key: "size", label: "Size x × y × z, mm", w: 92 },
    { key: "pos", label: "Position on parent, mm", w: 108 },
    { key: "yaw", label: "Yaw", w: 42, align: "right" },
    { key: "bond", label: "Bond line", w: 48, align: "right" },
    { key: "sup", label: "Support points, mm from its centre", w: 135.28 },
  ];
  l.ensure(60);
  l.y += tableHeader(doc, cols, ML, l.y);
  const style = { size: 7, lineHeight: 9 };
  for (const e of c.stack) {
    const parent = c.stack.find((p) => p.id === e.parent);
    const cells = [
      `${e.name} (${e.kind})`,
      `${mm(e.size.x)} × ${mm(e.size.y)} × ${mm(e.size.z)}`,
      e.parent
        ? `x ${mm(e.position.x)}, y ${mm(e.position.y)} from the ${positionReference(parent?.name ?? e.parent)}`
        : "the reference frame",
      e.parent ? `${deg(e.yawDeg)}°` : "—",
      e.parent ? `${um(e.bondThicknessUm)} µm` : "—",
      e.parent ? describeSupports(e) : "—",
    ];
    const rh = Math.max(16, ...cells.map((v, k) => paragraph(doc, v, 0, 0, cols[k].w - 8, style, false) + 8));
    if (l.y + rh > BOTTOM) {
      l.newPage();
      l.y += tableHeader(doc, cols, ML, l.y);
    }
    let x = ML;
    cells.forEach((v, k) => {
      const w = cols[k].w - 8;
      if (cols[k].align === "right") text(doc, v, x + 4, l.y + 4, { ...style, width: w, align: "right" });
      else paragraph(doc, v, x + 4, l.y + 4, w, { ...style, weight: k === 0 ? "bold" : "regular" });
      x += cols[k].w;
    });
    l.y += rh;
    rule(doc, ML, l.y, ML + CW, LINE, 0.5);
  }
  l.y += 14;
}

export function measurementPlan(l: Layout, c: ReportContent, meta: ReportMeta) {
  const { doc } = l;
  const s = MEASUREMENT_SAMPLE;
  section(
    l,
    "Measurement plan",
    `Take the readings per unit listed below on ${s.units} production units of your process (${s.subgroups} subgroups of ${s.subgroupSize} consecutive units, from at least ${s.lots} lots) before release to production, ` +
      `and at the same sample size after any change of material, equipment or site. Readings are absolute values against the nominal, in the unit stated, to the resolution stated or finer.`,
  );
  const cols: Col[] = [
    { key: "src", label: "Source", w: 84 },
    { key: "what", label: "What to measure, on which units", w: 179 },
    { key: "unit", label: "Unit, resolution", w: 64 },
    { key: "per", label: "Per unit", w: 56, align: "right" },
    { key: "n", label: "Units", w: 40, align: "right" },
    { key: "window", label: "Window", w: 76.28, align: "right" },
  ];
  l.ensure(50);
  l.y += tableHeader(doc, cols, ML, l.y);
  const style = { size: 7, lineHeight: 9 };
  for (const step of measurementSteps(c)) {
    const nominal = sourceNominal(step.tolerance, c.stack);
    const cells = [
      step.tolerance.source,
      step.what,
      `${step.unit === "deg" ? "°" : "µm"}, ${formatFixed(step.resolution, step.resolution)}`,
      String(step.readingsPerUnit),
      String(s.units),
      step.window ?? nominal.text,
    ];
    const rh = Math.max(16, ...cells.map((v, k) => paragraph(doc, v, 0, 0, cols[k].w - 8, style, false) + 8));
    if (l.y + rh > BOTTOM) {
      l.newPage();
      l.y += tableHeader(doc, cols, ML, l.y);
    }
    let x = ML;
    cells.forEach((v, k) => {
      const w = cols[k].w - 8;
      if (cols[k].align === "right") paragraph(doc, v, x + 4, l.y + 4, w, style);
      else paragraph(doc, v, x + 4, l.y + 4, w, { ...style, weight: k === 0 ? "bold" : "regular" });
      x += cols[k].w;
    });
    l.y += rh;
    rule(doc, ML, l.y, ML + CW, LINE, 0.5);
  }
  l.y += 8;
  const back =
    `How to send it back: one CSV or spreadsheet per lot, one row per unit, one column per reading (named by source and reading, e.g. "${c.tolerances[0]?.source ?? "gyro.bondLine"} support 0"), ` +
    `in the unit stated. Upload it on the report's page (${meta.link}) under measurements, with the lot number and a note on how it was measured (instrument, operator, date). ` +
    `The engineer compares it with the window and the capability asked, and the next study can use it in place of the tolerance.`;
  const h = paragraph(doc, back, ML, 0, CW, { size: 8 }, false);
  l.ensure(h + 8);
  l.y += paragraph(doc, back, ML, l.y, CW, { size: 8 }) + 14;
}
