/**
 * The dimensioned drawing of a stack, as geometry: where every element sits at its nominal
 * dimensions, what the top view and the side section show, which dimensions they carry, their
 * words, and the drafting scale. The report's PDF (backend/services/report-pdf-drawing.ts) and
 * the editor's drawing (frontend/features/stack-editor) both draw from here, each in its own
 * medium; neither works out a position or a dimension itself.
 *
 * Frames: the board's frame, x and y on its top face, z up from it (mm). An element's position
 * is its centre from the centre of its parent's top face along the parent's x and y; yaw turns
 * it about its centre from the parent's x axis (MODEL.md section 3). Bow and tolerances are left
 * out: the drawing is the nominal design.
 */
import { formatFixed } from "./format";
import { REPORT_RESOLUTION } from "./reports/nominals";
import type { StackFile } from "./schemas/stack-file";

/** What the drawing needs of an element (a report's frozen stack element has these and more). */
export interface DrawnElement {
  id: string;
  name: string;
  kind: string;
  parent: string | null;
  size: { x: number; y: number; z: number };
  position: { x: number; y: number };
  yawDeg: number;
  bondThicknessUm: number;
}

/** An element at its nominal place: centre (cx, cy) and yaw in the board's frame; bottom z0, top z1, its bond line from bond0 to z0. */
export interface Placed<E extends DrawnElement = DrawnElement> {
  e: E;
  /** 0 for the board, 1 for what sits on it, … */
  depth: number;
  cx: number;
  cy: number;
  yaw: number;
  z0: number;
  z1: number;
  bond0: number;
}

export type Pt = [number, number];

/** The drawing's elements from a stack file (names default to ids; no position, yaw or bond line means zero). */
export function drawnElements(stack: Pick<StackFile, "elements">): DrawnElement[] {
  return stack.elements.map((e) => ({
    id: e.id,
    name: e.name ?? e.id,
    kind: e.kind,
    parent: e.parent,
    size: e.size,
    position: e.position ?? { x: 0, y: 0 },
    yawDeg: e.yawDeg ?? 0,
    bondThicknessUm: e.bondLine?.thicknessUm ?? 0,
  }));
}

/** Every element at its nominal place in the board's frame (mm; z from the board's top face, bow left out). */
export function placeStack<E extends DrawnElement>(stack: readonly E[]): Placed<E>[] {
  const placed = new Map<string, Placed<E>>();
  const out: Placed<E>[] = [];
  let progressed = true;
  while (progressed && out.length < stack.length) {
    progressed = false;
    for (const e of stack) {
      if (placed.has(e.id)) continue;
      if (e.parent === null) {
        const p = { e, depth: 0, cx: 0, cy: 0, yaw: 0, z0: -e.size.z, z1: 0, bond0: 0 };
        placed.set(e.id, p);
        out.push(p);
        progressed = true;
        continue;
      }
      const parent = placed.get(e.parent);
      if (!parent) continue;
      const a = (parent.yaw * Math.PI) / 180;
      const z0 = parent.z1 + e.bondThicknessUm / 1000;
      const p = {
        e,
        depth: parent.depth + 1,
        cx: parent.cx + Math.cos(a) * e.position.x - Math.sin(a) * e.position.y,
        cy: parent.cy + Math.sin(a) * e.position.x + Math.cos(a) * e.position.y,
        yaw: parent.yaw + e.yawDeg,
        z0,
        z1: z0 + e.size.z,
        bond0: parent.z1,
      };
      placed.set(e.id, p);
      out.push(p);
      progressed = true;
    }
  }
  return out;
}

/** The four corners of a placed footprint in the board's frame. */
export function placedCorners(p: Placed): Pt[] {
  const a = (p.yaw * Math.PI) / 180;
  const hx = p.e.size.x / 2;
  const hy = p.e.size.y / 2;
  return [
    [-hx, -hy],
    [hx, -hy],
    [hx, hy],
    [-hx, hy],
  ].map(([x, y]) => [p.cx + Math.cos(a) * x - Math.sin(a) * y, p.cy + Math.sin(a) * x + Math.cos(a) * y]);
}

/** Half the width a (turned) footprint shows in the side section along x. */
export function sideHalfWidth(p: Placed): number {
  const b = (p.yaw * Math.PI) / 180;
  return (Math.abs(Math.cos(b)) * p.e.size.x + Math.abs(Math.sin(b)) * p.e.size.y) / 2;
}

/** Drawing scales a drafter would choose (enlargements for a package a few millimetres wide). */
export const DRAWING_SCALES = [1, 2, 5, 10, 20, 50, 100, 200] as const;
/** Points (1/72 in) and CSS pixels (1/96 in) per millimetre. */
export const PT_PER_MM = 72 / 25.4;
export const PX_PER_MM = 96 / 25.4;

/** The largest drafting scale at which `extentMm` fits in `room` (in units of which `unitsPerMm` make a millimetre). */
export function drawingScale(extentMm: number, room: number, unitsPerMm: number): number {
  const fit = room / (Math.max(extentMm, 1e-6) * unitsPerMm);
  return [...DRAWING_SCALES].reverse().find((s) => s <= fit) ?? DRAWING_SCALES[0];
}

/** The step of a drawing's scale bar at a drafting scale: 1, 5 or 10 mm, so the bar stays a few centimetres long. */
export function scaleBarStepMm(scale: number): number {
  const k = scale * PT_PER_MM;
  return k >= 60 ? 1 : k >= 12 ? 5 : 10;
}

/** A dimension between two points of the part (mm, board frame) and its words. */
export interface Dimension {
  from: Pt;
  to: Pt;
  label: string;
}

export interface Bounds {
  minX: number;
  maxX: number;
  minY: number;
  maxY: number;
}

const mm = (v: number) => formatFixed(v, REPORT_RESOLUTION.mm);
const um = (v: number) => formatFixed(v, REPORT_RESOLUTION.um);
const deg = (v: number) => formatFixed(v, REPORT_RESOLUTION.deg);

export interface TopViewItem<E extends DrawnElement = DrawnElement> {
  p: Placed<E>;
  /** the balloon's number, keyed to the list of positions */
  number: number;
  corners: Pt[];
  /** where the balloon's leader starts: the footprint's corner furthest right and down the page */
  balloonAt: Pt;
  /** "1  mag, 0.900 × 0.500 mm" */
  head: string;
  /** "x 0.000, y 0.050 mm from Accelerometer's centre; yaw 90.000°" */
  body: string;
}

export interface TopView<E extends DrawnElement = DrawnElement> {
  items: TopViewItem<E>[];
  bounds: Bounds;
  /** overall length and width of the package on the board (when it is not turned off the axes) */
  dimensions: { x: Dimension; y: Dimension } | null;
}

/** The top view, looking down on the board: every footprint above the board, numbered in stack order. */
export function topView<E extends DrawnElement>(placed: readonly Placed<E>[]): TopView<E> {
  const parts = placed.filter((p) => p.depth > 0);
  const pts = parts.flatMap(placedCorners);
  const bounds = {
    minX: Math.min(...pts.map((q) => q[0])),
    maxX: Math.max(...pts.map((q) => q[0])),
    minY: Math.min(...pts.map((q) => q[1])),
    maxY: Math.max(...pts.map((q) => q[1])),
  };
  const byId = new Map(placed.map((p) => [p.e.id, p.e] as const));
  const items = parts.map((p, i) => {
    const corners = placedCorners(p);
    const parentName = (p.e.parent !== null ? byId.get(p.e.parent)?.name : undefined) ?? p.e.parent;
    return {
      p,
      number: i + 1,
      corners,
      balloonAt: corners.reduce((best, q) => (q[0] - q[1] > best[0] - best[1] ? q : best), corners[0]),
      head: `${i + 1}  ${p.e.name}, ${mm(p.e.size.x)} × ${mm(p.e.size.y)} mm`,
      body: `x ${mm(p.e.position.x)}, y ${mm(p.e.position.y)} mm from ${parentName}'s centre; yaw ${deg(p.e.yawDeg)}°`,
    };
  });
  const root = parts.find((p) => p.depth === 1);
  let dimensions: TopView<E>["dimensions"] = null;
  if (root && root.yaw % 90 === 0) {
    const c = placedCorners(root);
    const x0 = Math.min(...c.map((q) => q[0]));
    const x1 = Math.max(...c.map((q) => q[0]));
    const y0 = Math.min(...c.map((q) => q[1]));
    const y1 = Math.max(...c.map((q) => q[1]));
    dimensions = {
      x: { from: [x0, y0], to: [x1, y0], label: `${mm(x1 - x0)} mm` },
      y: { from: [x0, y1], to: [x0, y0], label: `${mm(y1 - y0)} mm` },
    };
  }
  return { items, bounds, dimensions };
}

/**
 * The extent the top view's scale is chosen on: the wider of the footprints' height and their
 * width brought to the view's proportions (`aspect` = view height / view width).
 */
export function topViewExtent(view: TopView, aspect: number): number {
  const { minX, maxX, minY, maxY } = view.bounds;
  return Math.max((maxX - minX) * aspect, maxY - minY);
}

/**
 * Balloons stepped outward (down and right on the page, `step` each way) until each stands
 * `gap` clear of those before it: nested footprints can share a corner. Page units, y down.
 */
export function placeBalloons(at: readonly Pt[], gap: number, step: number): Pt[] {
  const out: Pt[] = [];
  for (const [x0, y0] of at) {
    let bx = x0;
    let by = y0;
    while (out.some(([qx, qy]) => Math.hypot(qx - bx, qy - by) < gap)) {
      bx += step;
      by += step;
    }
    out.push([bx, by]);
  }
  return out;
}

export interface SideItem<E extends DrawnElement = DrawnElement> {
  p: Placed<E>;
  /** left and right edges along x (board frame) */
  x0: number;
  x1: number;
  /** "mag 0.150 mm thick on 10.0 µm bond line" */
  head: string;
  /** "bottom at 0.790 mm, top at 0.940 mm" */
  body: string;
}

export interface SideSection<E extends DrawnElement = DrawnElement> {
  /** in stack order (drawing order) */
  items: SideItem<E>[];
  /** the same, top element first (the order of the labels) */
  labels: SideItem<E>[];
  minX: number;
  maxX: number;
  /** the stack's height above the board's top face */
  top: number;
  /** overall height, from the board's top face to the highest top */
  height: Dimension | null;
}

/** The side section along x, looking along +y: thicknesses and bond lines from the board's top face (z = 0). */
export function sideSection<E extends DrawnElement>(placed: readonly Placed<E>[]): SideSection<E> {
  const parts = placed.filter((p) => p.depth > 0);
  const items = parts.map((p) => ({
    p,
    x0: p.cx - sideHalfWidth(p),
    x1: p.cx + sideHalfWidth(p),
    head: `${p.e.name} ${mm(p.e.size.z)} mm thick on ${um(p.e.bondThicknessUm)} µm bond line`,
    body: `bottom at ${mm(p.z0)} mm, top at ${mm(p.z1)} mm`,
  }));
  const minX = Math.min(...items.map((s) => s.x0));
  const maxX = Math.max(...items.map((s) => s.x1));
  const top = Math.max(...parts.map((p) => p.z1));
  return {
    items,
    labels: [...items].sort((a, b) => b.p.z1 - a.p.z1),
    minX,
    maxX,
    top,
    height: top > 0 ? { from: [minX, top], to: [minX, 0], label: `${mm(top)} mm` } : null,
  };
}

/** The words under each view and beside the section. */
export const DRAWING_WORDS = {
  topView: "Top view, looking down on the board",
  sideSection: "Side section along x, looking along +y",
  heights: "heights from the board's top face (z = 0)",
  bondLine: "bond line",
} as const;
