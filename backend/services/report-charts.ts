/** The report's figures drawn as vector graphics: contributors, heading envelope, stack side view. */
import type { ReportContent } from "@shared/schemas/reports";
import { box, COLOURS, FAINT, INK, LINE, MUTED, paragraph, rule, text, type Doc } from "./pdf-draw";
import { formatNumber, formatShare } from "@shared/format";

export const OURS = COLOURS.mag;
const OTHERS = "#b9c0c9";

type Chart = ReportContent["contributors"][number];

const LABEL_W = 118;
const VALUE_W = 44;
const TITLE = { size: 8.5, weight: "bold" as const, lineHeight: 10.5 };
const METRIC = { size: 7.5, color: FAINT, lineHeight: 9 };
const BAR_LABEL = { size: 7.5, lineHeight: 9 };

type BarRow = { label: string; share: number; ours: boolean; rest: boolean; h: number };

/** The chart's rows with their heights: a long source id wraps onto more lines rather than being cut. */
function chartRows(doc: Doc, c: Chart): BarRow[] {
  const rows = c.bars.map((b) => ({ label: b.source, share: b.share, ours: b.ours, rest: false }));
  if (c.restShare > 0.0005) rows.push({ label: "all other sources", share: c.restShare, ours: false, rest: true });
  return rows.map((r) => ({ ...r, h: Math.max(15, paragraph(doc, r.label, 0, 0, LABEL_W - 8, BAR_LABEL, false) + 6) }));
}

function chartTitleHeight(doc: Doc, c: Chart, w: number) {
  return paragraph(doc, c.description, 0, 0, w, TITLE, false) + paragraph(doc, c.metric, 0, 0, w, METRIC, false) + 4;
}

export const contributorChartHeight = (doc: Doc, c: Chart, w: number) =>
  chartTitleHeight(doc, c, w) + chartRows(doc, c).reduce((a, r) => a + r.h, 0) + 15 + 8;

/** Horizontal bars: each source's share of the metric's spread, this supplier's in colour. */
export function contributorChart(doc: Doc, c: Chart, x: number, y: number, w: number) {
  const th = paragraph(doc, c.description, x, y, w, TITLE);
  paragraph(doc, c.metric, x, y + th, w, METRIC);
  const labelW = LABEL_W;
  const valueW = VALUE_W;
  const barX = x + labelW;
  const barW = w - labelW - valueW;
  const rows = chartRows(doc, c);
  const rowsH = rows.reduce((a, r) => a + r.h, 0);
  const top = Math.max(...c.bars.map((b) => b.share), c.restShare, 0.01);
  // a round end of scale, so the grid reads 10, 20, 30, 40 %
  const max = [0.05, 0.1, 0.2, 0.4, 0.6, 0.8, 1].find((m) => m >= top - 1e-9) ?? 1;
  let cy = y + chartTitleHeight(doc, c, w);
  // quarter grid lines so a bar's length reads without its number
  for (const f of [0, 0.25, 0.5, 0.75, 1]) {
    const gx = barX + barW * f;
    doc
      .save()
      .moveTo(gx, cy - 2)
      .lineTo(gx, cy + rowsH + 15)
      .lineWidth(0.4)
      .strokeColor(f === 0 ? "#a9a293" : "#ebe7de")
      .stroke()
      .restore();
    if (f > 0)
      text(doc, `${Math.round(max * f * 100)} %`, gx - 20, cy + rowsH + 16, {
        size: 6,
        color: FAINT,
        width: 40,
        align: "center",
      });
  }
  for (const b of rows) {
    paragraph(doc, b.label, x, cy + 1.5, labelW - 8, {
      ...BAR_LABEL,
      weight: b.ours ? "bold" : "regular",
      color: b.rest ? FAINT : b.ours ? INK : MUTED,
    });
    const bw = Math.max(0.8, (b.share / max) * barW);
    box(doc, barX, cy + 1, bw, 9.5, { fill: b.ours ? OURS : b.rest ? "#e3dfd5" : OTHERS, radius: 1.2 });
    text(doc, formatShare(b.share), barX + barW + 4, cy + 1.5, {
      size: 7.5,
      weight: b.ours ? "bold" : "regular",
      width: valueW - 4,
      align: "right",
      color: b.ours ? INK : MUTED,
    });
    cy += b.h;
  }
}

const TILT_COLOURS = [COLOURS.gyro, INK, COLOURS.accel, COLOURS.mag, COLOURS.substrate, COLOURS.asic, COLOURS.board];

function niceStep(range: number, target: number) {
  const raw = range / target;
  const p = 10 ** Math.floor(Math.log10(raw));
  const m = raw / p;
  return (m < 1.5 ? 1 : m < 3 ? 2 : m < 7 ? 5 : 10) * p;
}

/** Heading error against true heading, per tilt: the 5–95 % band of units and the median. */
export function envelopeChart(
  doc: Doc,
  env: NonNullable<ReportContent["envelope"]>,
  limit: number | null,
  x: number,
  y: number,
  w: number,
  h: number,
) {
  const tilts: Array<{ pitch: number; roll: number }> = [];
  for (const p of env.points)
    if (!tilts.some((t) => t.pitch === p.pitchDeg && t.roll === p.rollDeg)) tilts.push({ pitch: p.pitchDeg, roll: p.rollDeg });
  const lo = Math.min(...env.points.map((p) => p.p5), limit !== null ? -limit : 0);
  const hi = Math.max(...env.points.map((p) => p.p95), limit !== null ? limit : 0);
  const span = Math.max(hi - lo, 1e-6);
  const step = niceStep(span * 1.15, 6);
  const yMin = Math.floor((lo - span * 0.06) / step) * step;
  const yMax = Math.ceil((hi + span * 0.06) / step) * step;
  const plotX = x + 38;
  const plotW = w - 38 - 4;
  const plotY = y;
  const plotH = h - 22;
  const px = (hd: number) => plotX + (hd / 360) * plotW;
  const py = (v: number) => plotY + plotH - ((v - yMin) / (yMax - yMin)) * plotH;

  box(doc, plotX, plotY, plotW, plotH, { fill: "#fbfaf7", stroke: LINE });
  for (let v = yMin; v <= yMax + step / 2; v += step) {
    const yy = py(v);
    if (Math.abs(v) < step / 1000) rule(doc, plotX, yy, plotX + plotW, "#a9a293", 0.6);
    else rule(doc, plotX, yy, plotX + plotW, "#ebe7de", 0.4);
    text(doc, `${formatNumber(v, 2)}°`, x, yy - 3.5, { size: 6.5, color: MUTED, width: 34, align: "right" });
  }
  for (let hd = 0; hd <= 360; hd += 45) {
    const xx = px(hd);
    doc
      .save()
      .moveTo(xx, plotY)
      .lineTo(xx, plotY + plotH)
      .lineWidth(0.4)
      .strokeColor(hd % 90 === 0 ? "#e3ded2" : "#f0ece4")
      .stroke()
      .restore();
    text(doc, `${hd}°`, xx - 15, plotY + plotH + 4, { size: 6.5, color: MUTED, width: 30, align: "center" });
  }
  text(doc, "true heading", plotX + plotW - 80, plotY + plotH + 12, { size: 6.5, color: FAINT, width: 80, align: "right" });

  doc.save().rect(plotX, plotY, plotW, plotH).clip();
  tilts.forEach((t, i) => {
    const pts = env.points.filter((p) => p.pitchDeg === t.pitch && p.rollDeg === t.roll).sort((a, b) => a.headingDeg - b.headingDeg);
    if (pts.length < 2) return;
    // close the sweep at 360° with the 0° point so the band spans the whole axis
    const ring = pts[0].headingDeg === 0 ? [...pts, { ...pts[0], headingDeg: 360 }] : pts;
    const colour = TILT_COLOURS[i % TILT_COLOURS.length];
    // only the level band is filled: the tilted bands lie almost on it and would grey it out
    if (i === 0) {
      doc.save();
      doc.moveTo(px(ring[0].headingDeg), py(ring[0].p95));
      for (const p of ring.slice(1)) doc.lineTo(px(p.headingDeg), py(p.p95));
      for (const p of [...ring].reverse()) doc.lineTo(px(p.headingDeg), py(p.p5));
      doc.closePath().fillOpacity(0.1).fill(COLOURS.gyro);
      doc.restore();
    }
    doc.save();
    doc.moveTo(px(ring[0].headingDeg), py(ring[0].p50));
    for (const p of ring.slice(1)) doc.lineTo(px(p.headingDeg), py(p.p50));
    doc
      .lineWidth(i === 0 ? 1.3 : 0.9)
      .strokeColor(colour)
      .stroke();
    doc.restore();
    for (const key of ["p5", "p95"] as const) {
      doc.save();
      doc.moveTo(px(ring[0].headingDeg), py(ring[0][key]));
      for (const p of ring.slice(1)) doc.lineTo(px(p.headingDeg), py(p[key]));
      doc
        .lineWidth(i === 0 ? 0.7 : 0.5)
        .strokeColor(colour)
        .strokeOpacity(i === 0 ? 0.9 : 0.6);
      if (i > 0) doc.dash(2, { space: 2 });
      doc.stroke().undash();
      doc.restore();
    }
  });
  if (limit !== null) {
    for (const v of [limit, -limit]) {
      doc
        .save()
        .moveTo(plotX, py(v))
        .lineTo(plotX + plotW, py(v))
        .lineWidth(0.9)
        .dash(4, { space: 3 })
        .strokeColor(COLOURS.fail)
        .stroke()
        .undash()
        .restore();
    }
  }
  doc.restore();
  if (limit !== null)
    text(doc, `limit ±${formatNumber(limit, 3)}°`, plotX + plotW - 84, py(limit) - 10, {
      size: 6.5,
      weight: "bold",
      color: COLOURS.fail,
      width: 80,
      align: "right",
    });

  // legend
  let lx = plotX;
  const ly = y + h + 4;
  tilts.forEach((t, i) => {
    const label =
      t.pitch === 0 && t.roll === 0
        ? "level"
        : [t.pitch ? `pitch ${t.pitch > 0 ? "+" : ""}${t.pitch}°` : "", t.roll ? `roll ${t.roll > 0 ? "+" : ""}${t.roll}°` : ""]
            .filter(Boolean)
            .join(", ");
    const colour = TILT_COLOURS[i % TILT_COLOURS.length];
    if (i === 0) box(doc, lx, ly + 1.5, 12, 6, { fill: colour, fillOpacity: 0.18 });
    rule(doc, lx, ly + 4.5, lx + 12, colour, 1.1);
    lx += 16 + text(doc, label, lx + 16, ly, { size: 7, color: MUTED }) + 14;
  });
  return h + 16;
}

type El = ReportContent["stack"][number];

const KIND_COLOUR: Record<string, string> = {
  board: COLOURS.board,
  substrate: COLOURS.substrate,
  asic: COLOURS.asic,
  spacer: COLOURS.spacer,
  gyro: COLOURS.gyro,
  accel: COLOURS.accel,
  mag: COLOURS.mag,
};

/**
 * A schematic side view (looking along board y) of the package: each element at its x extent
 * and true thickness order, heights exaggerated to read; the supplier's elements outlined.
 */
export function sideView(doc: Doc, stack: El[], x: number, y: number, w: number, h: number) {
  type Placed = { e: El; x0: number; x1: number; z0: number; z1: number; bond0: number; depth: number };
  const placed = new Map<string, Placed>();
  const yawAbs = new Map<string, number>();
  const centre = new Map<string, { x: number; y: number }>();
  const order: El[] = [];
  const seen = new Set<string>();
  while (order.length < stack.length) {
    let progressed = false;
    for (const e of stack) {
      if (seen.has(e.id) || (e.parent !== null && !seen.has(e.parent))) continue;
      order.push(e);
      seen.add(e.id);
      progressed = true;
    }
    if (!progressed) break;
  }
  for (const e of order) {
    const parent = e.parent ? placed.get(e.parent) : undefined;
    const pYaw = e.parent ? (yawAbs.get(e.parent) ?? 0) : 0;
    const pc = e.parent ? (centre.get(e.parent) ?? { x: 0, y: 0 }) : { x: 0, y: 0 };
    const a = (pYaw * Math.PI) / 180;
    const cx = pc.x + Math.cos(a) * e.position.x - Math.sin(a) * e.position.y;
    const cyy = pc.y + Math.sin(a) * e.position.x + Math.cos(a) * e.position.y;
    const yaw = pYaw + (e.parent ? e.yawDeg : 0);
    const b = (yaw * Math.PI) / 180;
    const half = (Math.abs(Math.cos(b)) * e.size.x + Math.abs(Math.sin(b)) * e.size.y) / 2;
    const bond = parent ? e.bondThicknessUm / 1000 : 0;
    const z0 = parent ? parent.z1 + bond : 0;
    placed.set(e.id, {
      e,
      x0: cx - half,
      x1: cx + half,
      z0,
      z1: z0 + e.size.z,
      bond0: parent ? parent.z1 : 0,
      depth: parent ? parent.depth + 1 : 0,
    });
    yawAbs.set(e.id, yaw);
    centre.set(e.id, { x: cx, y: cyy });
  }
  const all = [...placed.values()];
  const board = all.find((p) => p.depth === 0);
  const rest = all.filter((p) => p.depth > 0);
  if (!board || rest.length === 0) return;

  // the package region, with room for labels at the right
  const minX = Math.min(...rest.map((p) => p.x0));
  const maxX = Math.max(...rest.map((p) => p.x1));
  const padX = (maxX - minX) * 0.28;
  const labelW = 150;
  const drawW = w - labelW - 10;
  const sx = drawW / (maxX - minX + 2 * padX);
  const boardH = 18;
  const topZ = Math.max(...rest.map((p) => p.z1));
  const baseZ = board.z1;
  const sz = (h - boardH - 22) / Math.max(topZ - baseZ, 1e-3);
  const X = (v: number) => x + (v - minX + padX) * sx;
  const Z = (z: number) => y + h - boardH - 6 - (z - baseZ) * sz;

  box(doc, x, y, w, h, { fill: "#fbfaf7", stroke: LINE, radius: 3 });
  // board: a strip broken at both ends (it extends far beyond the view)
  const bx0 = x + 8;
  const bx1 = x + drawW - 2;
  const by = Z(baseZ);
  doc.save();
  doc
    .moveTo(bx0, by)
    .lineTo(bx1, by)
    .lineTo(bx1 - 4, by + boardH / 2)
    .lineTo(bx1, by + boardH)
    .lineTo(bx0, by + boardH)
    .lineTo(bx0 + 4, by + boardH / 2)
    .closePath();
  doc.fillOpacity(0.9).fill(KIND_COLOUR.board);
  doc.restore();
  text(doc, `${board.e.id} (board, ${formatNumber(board.e.size.z, 2)} mm, drawn cut)`, bx0 + 8, by + boardH / 2 - 3.5, {
    size: 6.5,
    color: "#e9efe9",
  });

  const labels: Array<{ p: Placed; yMid: number }> = [];
  for (const p of rest.sort((a, b) => a.depth - b.depth)) {
    const colour = KIND_COLOUR[p.e.kind] ?? COLOURS.asic;
    const ours = p.e.sources.length > 0;
    // bond line: the adhesive between the element and its parent
    if (p.z0 > p.bond0) box(doc, X(p.x0) + 1.5, Z(p.z0), (p.x1 - p.x0) * sx - 3, Math.max(1, Z(p.bond0) - Z(p.z0)), { fill: "#d8cfae" });
    box(doc, X(p.x0), Z(p.z1), (p.x1 - p.x0) * sx, Math.max(1.5, Z(p.z0) - Z(p.z1)), {
      fill: colour,
      fillOpacity: ours ? 0.95 : 0.55,
      ...(ours ? { stroke: INK, lineWidth: 1.1 } : {}),
    });
    labels.push({ p, yMid: (Z(p.z0) + Z(p.z1)) / 2 });
  }
  // labels at the right, one per element, top to bottom without overlap
  labels.sort((a, b) => a.yMid - b.yMid);
  let lastY = y + 6;
  const lx = x + drawW + 10;
  for (const l of labels) {
    const ly = Math.max(l.yMid - 4, lastY);
    const ours = l.p.e.sources.length > 0;
    const head = `${l.p.e.id}  ·  ${l.p.e.kind}, ${formatNumber(l.p.e.size.z * 1000, 3)} µm`;
    const mine = l.p.e.sources.map((s) => s.slice(l.p.e.id.length + 1)).join(", ");
    const headStyle = { size: 6.8, weight: ours ? ("bold" as const) : ("regular" as const), color: ours ? INK : MUTED, lineHeight: 8.5 };
    const mineStyle = { size: 6.2, color: OURS, lineHeight: 8 };
    const hh = paragraph(doc, head, 0, 0, labelW - 6, headStyle, false);
    lastY = ly + hh + (ours ? paragraph(doc, mine, 0, 0, labelW - 6, mineStyle, false) : 0) + 2.5;
    doc
      .save()
      .moveTo(X(l.p.x1) + 1, l.yMid)
      .lineTo(lx - 4, ly + 4)
      .lineWidth(0.4)
      .strokeColor("#a9a293")
      .stroke()
      .restore();
    paragraph(doc, head, lx, ly, labelW - 6, headStyle);
    if (ours) paragraph(doc, mine, lx, ly + hh, labelW - 6, mineStyle);
  }
  const ptPerMm = 72 / 25.4;
  const scale = `scale about ${formatNumber(sx / ptPerMm, 2)} : 1 across; heights a further ${formatNumber(sz / sx, 2)}× exaggerated`;
  text(doc, scale, x + 8, y + 6, { size: 6, color: FAINT });
}
