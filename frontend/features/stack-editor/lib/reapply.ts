/**
 * Reapplying an engineer's unsaved edits on top of a draft someone else saved meanwhile: the
 * edits are what changed from the version they started from (`base`) to their document
 * (`mine`); each is laid over the current server document (`theirs`). Objects merge key by key,
 * element lists by element id (added, removed and changed elements each survive), other values
 * whole. Where both sides changed the same value differently, the engineer's value is taken
 * and the place is reported, so they can look at it before the draft saves again.
 */
import type { EditorDoc } from "./stack-ops";

type Json = unknown;

const isObject = (v: Json): v is Record<string, Json> => typeof v === "object" && v !== null && !Array.isArray(v);
const hasIds = (v: Json): v is Array<{ id: string }> => Array.isArray(v) && v.every((x) => isObject(x) && typeof x.id === "string");

/** Equal in meaning: the server keeps objects with their keys in another order. */
export function sameJson(a: Json, b: Json): boolean {
  if (a === b) return true;
  if (Array.isArray(a) || Array.isArray(b)) {
    return Array.isArray(a) && Array.isArray(b) && a.length === b.length && a.every((x, i) => sameJson(x, b[i]));
  }
  if (isObject(a) && isObject(b)) {
    const ka = Object.keys(a).filter((k) => a[k] !== undefined);
    const kb = Object.keys(b).filter((k) => b[k] !== undefined);
    return ka.length === kb.length && ka.every((k) => sameJson(a[k], b[k]));
  }
  return false;
}

function merge(base: Json, mine: Json, theirs: Json, path: string, overlaps: string[]): Json {
  if (sameJson(base, mine)) return theirs; // nothing of ours here
  if (sameJson(base, theirs) || sameJson(mine, theirs)) return mine; // only ours changed (or both alike)
  if (isObject(base) && isObject(mine) && isObject(theirs)) {
    const out: Record<string, Json> = {};
    for (const k of new Set([...Object.keys(theirs), ...Object.keys(mine)])) {
      const v = merge(base[k], mine[k], theirs[k], path ? `${path}.${k}` : k, overlaps);
      if (v !== undefined) out[k] = v;
    }
    return out;
  }
  if (hasIds(base) && hasIds(mine) && hasIds(theirs)) {
    const byId = (list: Array<{ id: string }>) => new Map(list.map((e) => [e.id, e]));
    const b = byId(base);
    const m = byId(mine);
    const out: Json[] = [];
    for (const t of theirs) {
      const inBase = b.get(t.id);
      const inMine = m.get(t.id);
      if (inBase && !inMine) {
        // we removed it; if they changed it meanwhile, say so
        if (!sameJson(inBase, t)) overlaps.push(`${path}[${t.id}]`);
        else continue;
      }
      out.push(inMine ? merge(inBase, inMine, t, `${path}[${t.id}]`, overlaps) : t);
    }
    const theirIds = new Set(theirs.map((t) => t.id));
    for (const e of mine) if (!b.has(e.id) && !theirIds.has(e.id)) out.push(e); // added by us
    return out;
  }
  overlaps.push(path || "the document");
  return mine;
}

export type Reapplied = {
  doc: EditorDoc;
  /** places both sides changed differently, where the engineer's value was taken */
  overlaps: string[];
};

/** `theirs` with the edits from `base` to `mine` laid over it. */
export function reapply(base: EditorDoc, mine: EditorDoc, theirs: EditorDoc): Reapplied {
  const overlaps: string[] = [];
  const doc = merge(base, mine, theirs, "", overlaps) as EditorDoc;
  return { doc, overlaps };
}
