import { describe, expect, it } from "vitest";
import { validateStackFile, type StackFile } from "@shared/schemas/stack-file";
import reference from "../fixtures/stack-reference.json" with { type: "json" };
import { errorsUnder, fieldError, fromServerFields, indexIssues, validateDoc } from "@frontend/features/stack-editor/lib/issues";
import { setAt } from "@frontend/features/stack-editor/lib/stack-ops";

const stack = reference as unknown as StackFile;

describe("problems placed on their fields", () => {
  it("splits validator paths into the element and the field inside it", () => {
    const idx = indexIssues([
      { path: "elements[2].size.x", message: "a" },
      { path: "elements[2].bondLine.supports[1]", message: "b" },
      { path: "elements[5]", message: "c" },
      { path: "requirements[0].metric", message: "d" },
      { path: "elements", message: "e" },
      { path: "", message: "f" },
    ]);
    expect(idx.count).toBe(6);
    expect(idx.elements.get(2)).toEqual([
      { field: "size.x", message: "a" },
      { field: "bondLine.supports[1]", message: "b" },
    ]);
    expect(idx.elements.get(5)).toEqual([{ field: "", message: "c" }]);
    expect(idx.requirements.get(0)).toEqual([{ field: "metric", message: "d" }]);
    expect(idx.general.map((g) => g.message)).toEqual(["e", "f"]);
    expect(fieldError(idx.elements.get(2), "size.x")).toBe("a");
    expect(fieldError(idx.elements.get(2), "size")).toBeUndefined();
    expect(errorsUnder(idx.elements.get(2), "bondLine").map((i) => i.message)).toEqual(["b"]);
    expect(errorsUnder(idx.elements.get(2), "bondLine.supports").map((i) => i.message)).toEqual(["b"]);
  });

  it("reads the server's paths, which name stack fields under stack.", () => {
    expect(
      fromServerFields([
        { path: "stack.elements[2].size.x", message: "a" },
        { path: "stack", message: "b" },
        { path: "requirements[1].metric", message: "c" },
      ]),
    ).toEqual([
      { path: "elements[2].size.x", message: "a" },
      { path: "", message: "b" },
      { path: "requirements[1].metric", message: "c" },
    ]);
  });

  it("finds the same problems as the validator, at the form's fields", () => {
    const broken = setAt(setAt(stack, ["elements", 5, "size", "x"], 0), ["elements", 3, "bondLine", "heightTol", "tol"], undefined);
    const issues = validateDoc({ stack: broken, requirements: [] });
    const v = validateStackFile(broken);
    expect(v.ok).toBe(false);
    expect(issues).toEqual(v.ok ? [] : v.issues);
    const idx = indexIssues(issues);
    expect(fieldError(idx.elements.get(5), "size.x")).toMatch(/must be greater than 0/);
    expect(fieldError(idx.elements.get(3), "bondLine.heightTol.tol")).toMatch(/half-width/);
  });

  it("checks requirements against their schema and the stack's metric ids", () => {
    const issues = validateDoc({
      stack,
      requirements: [
        { metric: "heading.maxAbsDeg", max: 2, yield: 0.99 },
        { metric: "mag.crossAxisTotalPct.w", max: 2, yield: 0.99 },
        { metric: "mag.tiltDeg", max: -1, yield: 1 },
      ],
    });
    const idx = indexIssues(issues);
    expect(idx.requirements.has(0)).toBe(false);
    expect(fieldError(idx.requirements.get(1), "metric")).toBe("the stack has no metric “mag.crossAxisTotalPct.w”");
    expect(fieldError(idx.requirements.get(2), "max")).toMatch(/greater than 0/);
    expect(fieldError(idx.requirements.get(2), "yield")).toMatch(/below 1/);
  });
});
