/** Page geometry and the building blocks every page of the report PDF shares: the layout cursor, section heads, table heads, pills. */
import { box, COLOURS, measure, MUTED, PAPER, paragraph, rule, text, INK, type Doc } from "./pdf-draw";
import { OURS } from "./report-charts";

export const W = 595.28;
export const H = 841.89;
export const ML = 48;
export const CW = W - 2 * ML;
export const TOP = 74;
export const BOTTOM = 782;

export class Layout {
  y = 0;
  /** sections are numbered in the order they are drawn (some are left out when they have nothing to show) */
  sections = 0;
  constructor(readonly doc: Doc) {}
  ensure(h: number) {
    if (this.y + h > BOTTOM) this.newPage();
  }
  newPage() {
    this.doc.addPage();
    this.y = TOP;
  }
}

export function brandStrip(doc: Doc, y: number, h: number) {
  const colours = [COLOURS.gyro, COLOURS.accel, COLOURS.mag, COLOURS.asic, COLOURS.substrate, COLOURS.board];
  const seg = W / colours.length;
  colours.forEach((c, i) => box(doc, i * seg, y, seg + 0.5, h, { fill: c }));
}

export function pill(doc: Doc, label: string, x: number, y: number, colour: string, align: "left" | "right" = "left") {
  const style = { size: 7, weight: "heavy" as const };
  const w = measure(doc, label, style) + 14;
  const bx = align === "right" ? x - w : x;
  box(doc, bx, y, w, 15, { fill: colour, radius: 7.5, fillOpacity: 0.1 });
  box(doc, bx, y, w, 15, { stroke: colour, radius: 7.5, lineWidth: 0.8 });
  text(doc, label, bx + 7, y + 4, { ...style, color: colour });
  return w;
}

export function section(l: Layout, title: string, lead?: string) {
  const { doc } = l;
  const num = String(++l.sections);
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

export type Col = { key: string; label: string; w: number; align?: "left" | "right" | "center" };

/** Capitals for Latin letters only: σ stays σ (Σ would be another symbol). */
export const caps = (s: string) => s.replace(/[a-z]/g, (ch) => ch.toUpperCase());

export function tableHeader(doc: Doc, cols: Col[], x: number, y: number) {
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
