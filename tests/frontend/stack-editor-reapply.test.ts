/** Reapplying an engineer's edits over a draft someone else saved meanwhile (lib/reapply.ts). */
import { describe, expect, it } from "vitest";
import type { StackFile } from "@shared/schemas/stack-file";
import reference from "../fixtures/stack-reference.json" with { type: "json" };
import { reapply, sameJson } from "@frontend/features/stack-editor/lib/reapply";
import type { EditorDoc } from "@frontend/features/stack-editor/lib/stack-ops";

const base: EditorDoc = { stack: structuredClone(reference) as unknown as StackFile, requirements: [] };
const copy = () => structuredClone(base);
const el = (d: EditorDoc, id: string) => d.stack.elements.find((e) => e.id === id)!;

describe("reapply", () => {
  it("keeps their change and ours when they touch different values", () => {
    const theirs = copy();
    el(theirs, "gyro").bondLine!.heightTol!.tol = 6;
    const mine = copy();
    el(mine, "mag").placementTol!.yawDeg!.tol = 0.25;
    mine.stack.name = "mine";
    const r = reapply(base, mine, theirs);
    expect(r.overlaps).toEqual([]);
    expect(el(r.doc, "gyro").bondLine!.heightTol!.tol).toBe(6);
    expect(el(r.doc, "mag").placementTol!.yawDeg!.tol).toBe(0.25);
    expect(r.doc.stack.name).toBe("mine");
    // everything else is theirs, unchanged
    expect(sameJson(el(r.doc, "board"), el(theirs, "board"))).toBe(true);
  });

  it("reads the server's document in any key order (it stores JSON with its keys sorted its own way)", () => {
    const reversed = (v: unknown): unknown =>
      Array.isArray(v)
        ? v.map(reversed)
        : v && typeof v === "object"
          ? Object.fromEntries(
              Object.entries(v)
                .reverse()
                .map(([k, x]) => [k, reversed(x)]),
            )
          : v;
    const theirs = reversed(base) as EditorDoc;
    expect(JSON.stringify(theirs)).not.toBe(JSON.stringify(base));
    expect(sameJson(theirs, base)).toBe(true);
    const mine = copy();
    mine.stack.name = "mine";
    const r = reapply(base, mine, theirs);
    expect(r.overlaps).toEqual([]);
    expect(r.doc.stack.name).toBe("mine");
  });

  it("keeps elements added or removed on either side, by id", () => {
    const theirs = copy();
    theirs.stack.elements = theirs.stack.elements.filter((e) => e.id !== "accel");
    const mine = copy();
    const extra = { ...structuredClone(el(base, "mag")), id: "mag2", name: "second magnetometer" };
    mine.stack.elements.push(extra);
    const r = reapply(base, mine, theirs);
    const ids = r.doc.stack.elements.map((e) => e.id);
    expect(ids).toContain("mag2");
    expect(ids).not.toContain("accel");
    expect(r.overlaps).toEqual([]);
  });

  it("takes our value where both changed the same one, and names the place", () => {
    const theirs = copy();
    el(theirs, "mag").bondLine!.heightTol!.tol = 2.5;
    const mine = copy();
    el(mine, "mag").bondLine!.heightTol!.tol = 6;
    const r = reapply(base, mine, theirs);
    expect(el(r.doc, "mag").bondLine!.heightTol!.tol).toBe(6);
    expect(r.overlaps).toEqual(["stack.elements[mag].bondLine.heightTol.tol"]);
  });

  it("does not drop an element they changed that we removed, and says so", () => {
    const theirs = copy();
    el(theirs, "accel").bondLine!.heightTol!.tol = 2;
    const mine = copy();
    mine.stack.elements = mine.stack.elements.filter((e) => e.id !== "accel");
    const r = reapply(base, mine, theirs);
    expect(r.doc.stack.elements.map((e) => e.id)).toContain("accel");
    expect(r.overlaps).toEqual(["stack.elements[accel]"]);
  });

  it("our requirements list replaces theirs only when we changed it", () => {
    const theirs = { ...copy(), requirements: [{ metric: "heading.maxAbsDeg", max: 2, yield: 0.99 }] } as EditorDoc;
    const mine = copy();
    mine.stack.name = "renamed";
    expect(reapply(base, mine, theirs).doc.requirements).toEqual(theirs.requirements);
    const mine2 = { ...copy(), requirements: [{ metric: "heading.maxAbsDeg", max: 1, yield: 0.95 }] } as EditorDoc;
    const r = reapply(base, mine2, theirs);
    expect(r.doc.requirements).toEqual(mine2.requirements);
    expect(r.overlaps).toEqual(["requirements"]);
  });
});
