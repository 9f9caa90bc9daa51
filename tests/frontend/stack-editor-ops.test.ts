import { describe, expect, it } from "vitest";
import { validateStackFile, type StackFile } from "@shared/schemas/stack-file";
import reference from "../fixtures/stack-reference.json" with { type: "json" };
import {
  addElement,
  descendantIds,
  moveElement,
  moveTargets,
  removeElement,
  renameElement,
  renameInMetric,
  reorderElement,
  setAt,
  treeRows,
} from "@frontend/features/stack-editor/lib/stack-ops";
import { starterStack } from "@frontend/features/stack-files";

const stack = reference as unknown as StackFile;
const ids = (s: StackFile) => s.elements.map((e) => e.id);

describe("path updates", () => {
  it("sets a value without touching the input, and removes empty groups with the last key", () => {
    const el = { id: "mag", placementTol: { xUm: { dist: "normal", tol: 5 } }, size: { x: 1, y: 1, z: 0.2 } };
    const set = setAt(el, ["placementTol", "yUm"], { dist: "normal", tol: 3 });
    expect(set.placementTol).toEqual({ xUm: { dist: "normal", tol: 5 }, yUm: { dist: "normal", tol: 3 } });
    expect(el.placementTol).toEqual({ xUm: { dist: "normal", tol: 5 } });
    const removed = setAt(el, ["placementTol", "xUm"], undefined);
    expect(removed).toEqual({ id: "mag", size: { x: 1, y: 1, z: 0.2 } });
    // arrays keep their entries; a number key indexes
    const doc = { elements: [{ a: 1 }, { a: 2 }] };
    expect(setAt(doc, ["elements", 1, "a"], 5)).toEqual({ elements: [{ a: 1 }, { a: 5 }] });
    expect(setAt(doc, ["elements", 1, "a"], undefined)).toEqual({ elements: [{ a: 1 }, {}] });
  });
});

describe("the element tree", () => {
  it("lists the reference stack depth first with depths and sibling positions", () => {
    const rows = treeRows(stack);
    expect(rows.map((r) => [r.id, r.depth])).toEqual([
      ["board", 0],
      ["pkg", 1],
      ["asic", 2],
      ["gyro", 3],
      ["accel", 4],
      ["mag", 5],
    ]);
  });

  it("shows an element whose parent is missing at the top, marked", () => {
    const s: StackFile = {
      ...stack,
      elements: [...stack.elements, { id: "stray", kind: "spacer", parent: "nowhere", size: { x: 1, y: 1, z: 0.1 } }],
    };
    const stray = treeRows(s).find((r) => r.id === "stray")!;
    expect(stray.orphan).toBe(true);
    expect(stray.depth).toBe(0);
  });

  it("adds a die on any element with a fresh id, sized to fit, after the parent's subtree", () => {
    const a = addElement(stack, "asic", "mag");
    expect(a.id).toBe("mag-2");
    const el = a.stack.elements.find((e) => e.id === "mag-2")!;
    expect(el.parent).toBe("asic");
    expect(el.size.x).toBeLessThanOrEqual(stack.elements.find((e) => e.id === "asic")!.size.x);
    expect(ids(a.stack).indexOf("mag-2")).toBe(ids(stack).length); // asic's subtree runs to the end of the file
    expect(validateStackFile(a.stack).ok).toBe(true);
    const b = addElement(stack, "board", "spacer");
    expect(ids(b.stack)).toEqual(["board", "pkg", "asic", "gyro", "accel", "mag", "spacer"]);
    const c = addElement(starterStack("x"), "board", "substrate");
    expect(c.stack.elements[1]).toMatchObject({ id: "substrate", parent: "board", stage: "board" });
  });

  it("removes an element with everything on it, never the board", () => {
    const r = removeElement(stack, "gyro");
    expect(ids(r.stack)).toEqual(["board", "pkg", "asic"]);
    expect(r.removed.sort()).toEqual(["accel", "gyro", "mag"]);
    expect(removeElement(stack, "board").stack).toBe(stack);
  });

  it("moves an element onto another one but never onto itself or what sits on it", () => {
    expect(moveTargets(stack, "gyro").map((e) => e.id)).toEqual(["board", "pkg"]);
    expect(moveElement(stack, "gyro", "mag")).toBe(stack);
    const moved = moveElement(stack, "mag", "asic");
    expect(moved.elements.find((e) => e.id === "mag")!.parent).toBe("asic");
    expect(validateStackFile(moved).ok).toBe(true);
    // a position off the new parent's top face is centred
    const s: StackFile = { ...stack, elements: stack.elements.map((e) => (e.id === "pkg" ? { ...e, position: { x: 12, y: 0 } } : e)) };
    const onAsic = moveElement(s, "pkg", "board");
    expect(onAsic.elements.find((e) => e.id === "pkg")!.position).toEqual({ x: 12, y: 0 });
    const s2 = addElement(stack, "board", "spacer").stack;
    const withPos = { ...s2, elements: s2.elements.map((e) => (e.id === "spacer" ? { ...e, position: { x: 10, y: 5 } } : e)) };
    expect(moveElement(withPos, "spacer", "pkg").elements.find((e) => e.id === "spacer")!.position).toEqual({ x: 0, y: 0 });
  });

  it("reorders among siblings only", () => {
    let s = addElement(stack, "pkg", "spacer").stack;
    expect(
      treeRows(s)
        .filter((r) => r.parent === "pkg")
        .map((r) => r.id),
    ).toEqual(["asic", "spacer"]);
    s = reorderElement(s, "spacer", -1);
    expect(
      treeRows(s)
        .filter((r) => r.parent === "pkg")
        .map((r) => r.id),
    ).toEqual(["spacer", "asic"]);
    expect(reorderElement(s, "spacer", -1)).toBe(s);
    expect(reorderElement(s, "board", 1)).toBe(s);
  });

  it("renames an element: children and requirement metrics follow", () => {
    const doc = {
      stack,
      requirements: [
        { metric: "mag.crossAxisTotalPct.x", max: 2, yield: 0.99 },
        { metric: "accel~mag.relRotDeg", max: 0.5, yield: 0.99 },
        { metric: "heading.maxAbsDeg", max: 2, yield: 0.99 },
      ],
    };
    const r = renameElement(doc, "accel", "acc");
    expect(r.stack.elements.find((e) => e.id === "mag")!.parent).toBe("acc");
    expect(r.requirements.map((x) => x.metric)).toEqual(["mag.crossAxisTotalPct.x", "acc~mag.relRotDeg", "heading.maxAbsDeg"]);
    expect(renameInMetric("magnet.tiltDeg", "mag", "m")).toBe("magnet.tiltDeg");
    expect(descendantIds(r.stack, "acc")).toEqual(new Set(["mag"]));
  });
});
