/**
 * Geometry warnings of a stack: slips that still compile but cannot be built as drawn.
 * A footprint (with its yaw) reaching past its parent's top face, two siblings whose
 * footprints overlap, an edge clearance below the set value, dies taller than the package
 * body when the body height is given. Warnings never block saving; they carry the path of
 * the element they belong to (`elements[3].position`) like the validator's problems.
 *
 * Footprints are rectangles in the parent's top-face frame: centre at `position`, turned by
 * `yawDeg` about z (MODEL.md section 3, `Rz(yaw)`), placement tolerances left out (the
 * nominal design is what is checked). Two turned rectangles overlap when no separating axis
 * exists among their four edge normals (the separating axis theorem for convex polygons).
 */
import type { StackElement, StackFile } from "./schemas/stack-file";

export interface GeometryWarning {
  path: string;
  message: string;
}

/**
 * Smallest distance from a footprint to its parent's edge before a warning: room for the
 * adhesive fillet and the bond pads around a die, and keep-out from the board's edge for
 * a package. Common practice, from memory; a stack can set its own in `meta.edgeClearanceMm`.
 */
export const EDGE_CLEARANCE_MM = { onDie: 0.1, onBoard: 0.5 } as const;

/** Where a package gives its body height (mm, substrate bottom to body top): `meta.bodyHeightMm`. */
export const BODY_HEIGHT_KEY = "bodyHeightMm";

type Pt = { x: number; y: number };

/** The four corners of an element's footprint in its parent's frame. */
export function footprintCorners(e: Pick<StackElement, "size" | "position" | "yawDeg">): Pt[] {
  const hx = e.size.x / 2,
    hy = e.size.y / 2;
  const a = ((e.yawDeg ?? 0) * Math.PI) / 180;
  const c = Math.cos(a),
    s = Math.sin(a);
  const px = e.position?.x ?? 0,
    py = e.position?.y ?? 0;
  return [
    [-hx, -hy],
    [hx, -hy],
    [hx, hy],
    [-hx, hy],
  ].map(([x, y]) => ({ x: px + c * x - s * y, y: py + s * x + c * y }));
}

/**
 * How deep two convex polygons overlap: the smallest overlap of their projections over
 * every edge normal of both, or 0 when one of those axes separates them.
 */
export function overlapDepth(a: Pt[], b: Pt[]): number {
  let depth = Infinity;
  for (const poly of [a, b]) {
    for (let i = 0; i < poly.length; i++) {
      const p = poly[i],
        q = poly[(i + 1) % poly.length];
      const len = Math.hypot(q.x - p.x, q.y - p.y);
      if (len === 0) continue;
      const nx = -(q.y - p.y) / len,
        ny = (q.x - p.x) / len;
      const proj = (pts: Pt[]) => {
        let lo = Infinity,
          hi = -Infinity;
        for (const v of pts) {
          const d = v.x * nx + v.y * ny;
          if (d < lo) lo = d;
          if (d > hi) hi = d;
        }
        return [lo, hi] as const;
      };
      const [alo, ahi] = proj(a);
      const [blo, bhi] = proj(b);
      const o = Math.min(ahi, bhi) - Math.max(alo, blo);
      if (o <= 0) return 0;
      if (o < depth) depth = o;
    }
  }
  return depth === Infinity ? 0 : depth;
}

const EPS = 1e-6;
const mm = (v: number) => `${String(Math.round(v * 1000) / 1000)} mm`;
const isNum = (v: unknown): v is number => typeof v === "number" && Number.isFinite(v);

function usable(e: StackElement | undefined): e is StackElement {
  return !!e && !!e.size && isNum(e.size.x) && isNum(e.size.y) && e.size.x > 0 && e.size.y > 0;
}

/** Every geometry warning of a validated stack, in element order. */
export function geometryWarnings(stack: StackFile): GeometryWarning[] {
  const out: GeometryWarning[] = [];
  const els = stack.elements;
  const index = new Map(els.map((e, i) => [e.id, i] as const));
  const metaClearance = stack.meta?.edgeClearanceMm;
  const name = (e: StackElement) => `"${e.id}"`;

  // Overhang and clearance against the parent's top face.
  els.forEach((e, i) => {
    if (e.parent === null || !usable(e)) return;
    const p = els[index.get(e.parent) ?? -1];
    if (!usable(p)) return;
    const hx = p.size.x / 2,
      hy = p.size.y / 2;
    const corners = footprintCorners(e);
    // signed distance of the footprint to the parent's edge: negative when it reaches past it
    const margin = Math.min(...corners.map((c) => Math.min(hx - Math.abs(c.x), hy - Math.abs(c.y))));
    const wanted = isNum(metaClearance) ? metaClearance : p.kind === "board" ? EDGE_CLEARANCE_MM.onBoard : EDGE_CLEARANCE_MM.onDie;
    if (margin < -EPS) {
      out.push({
        path: `elements[${i}].position`,
        message: `${name(e)} hangs ${mm(-margin)} past the edge of its parent ${name(p)}${e.yawDeg ? ` (turned ${String(e.yawDeg)}°)` : ""}: part of its footprint has nothing under it`,
      });
    } else if (margin < wanted - EPS) {
      out.push({
        path: `elements[${i}].position`,
        message: `${name(e)} is ${mm(margin)} from the edge of ${name(p)}; keep at least ${mm(wanted)} for the ${p.kind === "board" ? "board's keep-out" : "adhesive fillet and bond pads"}`,
      });
    }
  });

  // Siblings whose footprints overlap (each named on both elements).
  const children = new Map<string, number[]>();
  els.forEach((e, i) => {
    if (e.parent === null || !usable(e)) return;
    children.set(e.parent, [...(children.get(e.parent) ?? []), i]);
  });
  for (const [parent, list] of children) {
    for (let a = 0; a < list.length; a++)
      for (let b = a + 1; b < list.length; b++) {
        const ea = els[list[a]],
          eb = els[list[b]];
        const depth = overlapDepth(footprintCorners(ea), footprintCorners(eb));
        if (depth <= EPS) continue;
        const msg = (x: StackElement, y: StackElement) =>
          `the footprint of ${name(x)} overlaps ${name(y)} on ${JSON.stringify(parent)} by ${mm(depth)}: both cannot sit there`;
        out.push({ path: `elements[${list[a]}].position`, message: msg(ea, eb) });
        out.push({ path: `elements[${list[b]}].position`, message: msg(eb, ea) });
      }
  }

  // Dies taller than the package body, where a package gives its body height.
  els.forEach((pkg) => {
    const body = pkg.meta?.[BODY_HEIGHT_KEY];
    if (!isNum(body) || body <= 0 || !usable(pkg)) return;
    const top = new Map<string, number>([[pkg.id, pkg.size.z]]);
    // parents come before children in a tree walk; repeat until nothing changes (small stacks)
    let grew = true;
    while (grew) {
      grew = false;
      for (const e of els) {
        if (e.parent === null || top.has(e.id) || !top.has(e.parent) || !isNum(e.size?.z)) continue;
        top.set(e.id, top.get(e.parent)! + (e.bondLine?.thicknessUm ?? 0) / 1000 + e.size.z);
        grew = true;
      }
    }
    for (const [id, h] of top) {
      if (id === pkg.id || h <= body + EPS) continue;
      const i = index.get(id)!;
      out.push({
        path: `elements[${i}].size.z`,
        message: `the top of ${name(els[i])} is ${mm(h)} above the bottom of the package ${name(pkg)}, ${mm(h - body)} more than its ${mm(body)} body`,
      });
    }
  });
  return out.sort((x, y) => elementIndexOf(x.path) - elementIndexOf(y.path));
}

function elementIndexOf(path: string): number {
  const m = /^elements\[(\d+)\]/.exec(path);
  return m ? Number(m[1]) : -1;
}
