/**
 * Pure edits of the stack document: immutable path updates, the element tree and the
 * operations of the tree (add, remove, move to another parent, reorder, rename).
 * Every function returns a new document and leaves its input alone, so the undo
 * history can keep the old one.
 */
import type { ElementKind, StackElement, StackFile } from "@shared/schemas/stack-file";
import { toleranceFrom, typicalForSlot } from "@shared/typical-tolerances";
import type { Requirement } from "@shared/schemas/study-file";

/** What the editor edits and saves: the stack file and the revision's requirements. */
export interface EditorDoc {
  stack: StackFile;
  requirements: Requirement[];
}

export type Path = ReadonlyArray<string | number>;

type Loose = Record<string, unknown>;
const isPlain = (v: unknown): v is Loose => typeof v === "object" && v !== null && !Array.isArray(v);

export function getAt(obj: unknown, path: Path): unknown {
  let cur: unknown = obj;
  for (const k of path) {
    if (cur === null || typeof cur !== "object") return undefined;
    cur = (cur as Loose)[k as string];
  }
  return cur;
}

/**
 * A copy of `obj` with `value` at `path`. `undefined` removes the key, and an object left
 * empty by that inside another object goes too (an absent tolerance group is the same as
 * an empty one, and the exported file stays tidy). Array entries are never pruned.
 */
export function setAt<T>(obj: T, path: Path, value: unknown): T {
  if (path.length === 0) return value as T;
  const [head, ...rest] = path;
  const base: unknown = obj;
  if (typeof head === "number") {
    const arr = Array.isArray(base) ? [...base] : [];
    arr[head] = setAt(arr[head], rest, value);
    return arr as T;
  }
  const o: Loose = isPlain(base) ? { ...base } : {};
  const next = rest.length === 0 ? value : setAt(o[head], rest, value);
  const emptied = rest.length > 0 && isPlain(next) && Object.keys(next).length === 0;
  if (next === undefined || emptied) {
    delete o[head];
  } else {
    o[head] = next;
  }
  return o as T;
}

// ---------------------------------------------------------------- the tree

export interface TreeRow {
  id: string;
  /** index in the file's element list */
  index: number;
  depth: number;
  kind: ElementKind;
  parent: string | null;
  /** the parent is missing or part of a cycle: shown at the top level */
  orphan: boolean;
  childCount: number;
  /** position among the siblings (file order) */
  siblingIndex: number;
  siblingCount: number;
}

export function childrenOf(stack: StackFile, id: string): StackElement[] {
  return stack.elements.filter((e) => e.parent === id);
}

/** The elements as a tree, depth first, siblings in file order. */
export function treeRows(stack: StackFile): TreeRow[] {
  const els = stack.elements;
  const rows: TreeRow[] = [];
  const visited = new Set<number>();
  const visit = (index: number, depth: number, orphan: boolean, siblingIndex: number, siblingCount: number) => {
    if (visited.has(index)) return;
    visited.add(index);
    const e = els[index];
    const kids = els.map((c, i) => ({ c, i })).filter(({ c, i }) => c.parent === e.id && i !== index);
    rows.push({ id: e.id, index, depth, kind: e.kind, parent: e.parent, orphan, childCount: kids.length, siblingIndex, siblingCount });
    kids.forEach(({ i }, k) => visit(i, depth + 1, false, k, kids.length));
  };
  const roots = els.map((e, i) => ({ e, i })).filter(({ e }) => e.parent === null);
  roots.forEach(({ i }, k) => visit(i, 0, false, k, roots.length));
  // Elements whose parent is unknown, or that sit in a cycle, are still shown (with their problem).
  els.forEach((e, i) => {
    if (!visited.has(i)) visit(i, 0, true, 0, 1);
  });
  return rows;
}

/** The ids of every element that sits (directly or not) on `id`. */
export function descendantIds(stack: StackFile, id: string): Set<string> {
  const out = new Set<string>();
  const queue = [id];
  while (queue.length) {
    const cur = queue.shift()!;
    for (const e of stack.elements) {
      if (e.parent === cur && !out.has(e.id) && e.id !== id) {
        out.add(e.id);
        queue.push(e.id);
      }
    }
  }
  return out;
}

export function uniqueId(stack: StackFile, base: string): string {
  const taken = new Set(stack.elements.map((e) => e.id));
  if (!taken.has(base)) return base;
  for (let n = 2; ; n++) if (!taken.has(`${base}-${n}`)) return `${base}-${n}`;
}

/** What a new element of each kind starts as (mm), before it is fitted onto its parent. */
const NEW_SIZE: Record<ElementKind, { x: number; y: number; z: number }> = {
  board: { x: 40, y: 30, z: 1.0 },
  substrate: { x: 3.0, y: 3.0, z: 0.25 },
  asic: { x: 2.4, y: 2.2, z: 0.15 },
  spacer: { x: 1.2, y: 1.2, z: 0.1 },
  gyro: { x: 1.6, y: 1.4, z: 0.3 },
  accel: { x: 1.4, y: 1.2, z: 0.25 },
  mag: { x: 1.0, y: 1.0, z: 0.2 },
};

export const ADDABLE_KINDS: ElementKind[] = ["gyro", "accel", "mag", "spacer", "asic", "substrate"];

const round = (v: number, step: number) => Math.round(v / step) * step;

export function newElement(stack: StackFile, parentId: string, kind: ElementKind): StackElement {
  const parent = stack.elements.find((e) => e.id === parentId);
  const s = NEW_SIZE[kind];
  const fit = (v: number, p: number | undefined) => (p && p > 0 ? Math.min(v, Math.max(0.05, round(p * 0.8, 0.05))) : v);
  const size = { x: +fit(s.x, parent?.size?.x).toFixed(2), y: +fit(s.y, parent?.size?.y).toFixed(2), z: s.z };
  // the sources that turn the element start from their typical values, never from zero
  const typical = (slot: string[]) => {
    const t = typicalForSlot({ kind, parent: parentId }, slot, parent?.kind);
    return t ? toleranceFrom(t) : undefined;
  };
  const axis = typical(["axisTol"]);
  return {
    id: uniqueId(stack, kind),
    kind,
    parent: parentId,
    ...(kind === "substrate" && parent?.kind === "board" ? { stage: "board" as const } : {}),
    position: { x: 0, y: 0 },
    size,
    bondLine: { thicknessUm: kind === "substrate" ? 60 : 20, heightTol: typical(["bondLine", "heightTol"]) },
    placementTol: { yawDeg: typical(["placementTol", "yawDeg"]) },
    ...(axis ? { axisTol: axis } : {}),
  };
}

/** Index after the last element of `id`'s subtree, in file order. */
function endOfSubtree(stack: StackFile, id: string): number {
  const inside = descendantIds(stack, id);
  inside.add(id);
  let last = -1;
  stack.elements.forEach((e, i) => {
    if (inside.has(e.id)) last = i;
  });
  return last + 1;
}

export function addElement(stack: StackFile, parentId: string, kind: ElementKind): { stack: StackFile; id: string } {
  const el = newElement(stack, parentId, kind);
  const at = endOfSubtree(stack, parentId);
  const elements = [...stack.elements];
  elements.splice(at === 0 ? elements.length : at, 0, el);
  return { stack: { ...stack, elements }, id: el.id };
}

/** Removes the element and everything that sits on it. The board cannot be removed. */
export function removeElement(stack: StackFile, id: string): { stack: StackFile; removed: string[] } {
  const el = stack.elements.find((e) => e.id === id);
  if (!el || el.parent === null) return { stack, removed: [] };
  const gone = descendantIds(stack, id);
  gone.add(id);
  return { stack: { ...stack, elements: stack.elements.filter((e) => !gone.has(e.id)) }, removed: [...gone] };
}

/** Elements that `id` may move onto: not itself, nothing that sits on it. */
export function moveTargets(stack: StackFile, id: string): StackElement[] {
  const below = descendantIds(stack, id);
  const el = stack.elements.find((e) => e.id === id);
  return stack.elements.filter((e) => e.id !== id && !below.has(e.id) && e.id !== el?.parent);
}

/**
 * Puts `id` on another parent. The position is kept when it still lies on the new
 * parent's top face, and centred otherwise.
 */
export function moveElement(stack: StackFile, id: string, newParent: string): StackFile {
  const el = stack.elements.find((e) => e.id === id);
  const target = stack.elements.find((e) => e.id === newParent);
  if (!el || !target || el.parent === null || newParent === id || descendantIds(stack, id).has(newParent)) return stack;
  const p = el.position;
  const fits = p && target.size && Math.abs(p.x) <= target.size.x / 2 && Math.abs(p.y) <= target.size.y / 2;
  const moved: StackElement = { ...el, parent: newParent, position: fits ? p : { x: 0, y: 0 } };
  // File order: parents first reads best, so the element goes after its new parent's subtree.
  const rest = { ...stack, elements: stack.elements.filter((e) => e.id !== id) };
  const elements = [...rest.elements];
  elements.splice(endOfSubtree(rest, newParent), 0, moved);
  return { ...stack, elements };
}

/** Moves `id` one place up (-1) or down (+1) among its siblings. */
export function reorderElement(stack: StackFile, id: string, dir: -1 | 1): StackFile {
  const el = stack.elements.find((e) => e.id === id);
  if (!el) return stack;
  const siblings = stack.elements.filter((e) => e.parent === el.parent);
  const k = siblings.indexOf(el);
  const neighbour = siblings[k + dir];
  if (!neighbour) return stack;
  const rest = stack.elements.filter((e) => e !== el);
  const n = rest.indexOf(neighbour);
  const elements = [...rest];
  elements.splice(dir < 0 ? n : n + 1, 0, el);
  return { ...stack, elements };
}

/** Metric ids name elements; a renamed element keeps its requirements. */
export function renameInMetric(metric: string, from: string, to: string): string {
  const dot = metric.indexOf(".");
  if (dot < 0) return metric;
  const head = metric.slice(0, dot);
  const parts = head.split("~").map((p) => (p === from ? to : p));
  return parts.join("~") + metric.slice(dot);
}

/** Renames an element: its children follow, and so do requirements on its metrics. */
export function renameElement(doc: EditorDoc, from: string, to: string): EditorDoc {
  if (from === to) return doc;
  const elements = doc.stack.elements.map((e) => ({
    ...e,
    id: e.id === from ? to : e.id,
    parent: e.parent === from ? to : e.parent,
  }));
  const requirements = doc.requirements.map((r) => {
    const metric = renameInMetric(r.metric, from, to);
    return metric === r.metric ? r : { ...r, metric };
  });
  return { stack: { ...doc.stack, elements }, requirements };
}
