/**
 * Words a person reads (issue 14, item 4): yields typed and shown in %, places named in words
 * and units as symbols, never a JSON path or "um".
 */
import { useMemo, type ReactNode } from "react";
import { cleanup, fireEvent, render, screen } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import type { StackFile } from "@shared/schemas/stack-file";
import { fieldLabel, pathLabel, placeLabel, readableMessage } from "@shared/field-labels";
import { fieldProblemText } from "@frontend/lib/form";
import reference from "../fixtures/stack-reference.json" with { type: "json" };
import { EditorContext, type EditorApi } from "@frontend/features/stack-editor/components/editor-context";
import { ProblemList } from "@frontend/features/stack-editor/components/problem-list";
import { RequirementsEditor } from "@frontend/features/stack-editor/components/requirements-editor";
import { useEditorHistory } from "@frontend/features/stack-editor/hooks/use-editor-history";
import { indexIssues, validateDoc } from "@frontend/features/stack-editor/lib/issues";
import type { EditorDoc } from "@frontend/features/stack-editor/lib/stack-ops";
import { parseYieldPercent, yieldPercentText } from "@frontend/features/stack-editor/lib/yield-text";

vi.setConfig({ testTimeout: 30_000 });
afterEach(cleanup);

let latest: EditorDoc;
function Harness({ initial, children }: { initial: EditorDoc; children: ReactNode }) {
  const { doc, update, setAt } = useEditorHistory(initial);
  const issues = useMemo(() => indexIssues(validateDoc(doc)), [doc]);
  latest = doc;
  const api: EditorApi = {
    doc,
    readOnly: false,
    issues,
    update,
    setAt,
    selectedId: null,
    select: () => undefined,
    suppliers: [],
    warnings: new Map(),
  };
  return <EditorContext.Provider value={api}>{children}</EditorContext.Provider>;
}
const stack = () => structuredClone(reference) as unknown as StackFile;

describe("yields in %", () => {
  it("reads 99.73 as 0.9973 and refuses what cannot be a yield, saying why in %", () => {
    expect(parseYieldPercent("99.73")).toEqual({ ok: true, value: 0.9973 });
    expect(parseYieldPercent("99,9937 %")).toEqual({ ok: true, value: 0.999937 });
    expect(parseYieldPercent("")).toEqual({ ok: true, value: undefined });
    const full = parseYieldPercent("100");
    expect(full.ok ? "" : full.message).toMatch(/below 100 %/);
    const fraction = parseYieldPercent("0.9973");
    expect(fraction.ok ? "" : fraction.message).toMatch(/typed in %.*type 99\.73 for 99\.73 %/);
    const zero = parseYieldPercent("0");
    expect(zero.ok ? "" : zero.message).toMatch(/above 0 %/);
    expect(parseYieldPercent("abc").ok).toBe(false);
    expect(yieldPercentText(0.9973)).toBe("99.73");
    expect(yieldPercentText(0.999999)).toBe("99.9999");
  });

  it("the requirement's yield box shows and takes %", () => {
    render(
      <Harness initial={{ stack: stack(), requirements: [{ metric: "heading.maxAbsDeg", max: 2, yield: 0.9973 }] }}>
        <RequirementsEditor estimate={null} estimateStale={false} />
      </Harness>,
    );
    const box = screen.getByLabelText("Requirement 1 yield target") as HTMLInputElement;
    expect(box.value).toBe("99.73");
    fireEvent.change(box, { target: { value: "99.9" } });
    expect(latest.requirements[0].yield).toBe(0.999);
    // 100 cannot be a yield: the reason shows, the stored value stays
    fireEvent.change(box, { target: { value: "100" } });
    expect(screen.getByRole("alert").textContent).toMatch(/must be below 100 %/);
    expect(box.getAttribute("aria-invalid")).toBe("true");
    expect(latest.requirements[0].yield).toBe(0.999);
    fireEvent.change(box, { target: { value: "99.73" } });
    expect(screen.queryByRole("alert")).toBeNull();
    expect(latest.requirements[0].yield).toBe(0.9973);
  });
});

describe("places and units in words", () => {
  it("labels a path with the element's name and the field in words and units", () => {
    const s = stack();
    expect(pathLabel("stack.elements[5].bondLine.thicknessUm", s)).toBe("mag: bond-line thickness (µm)");
    expect(pathLabel("elements[3].size.x", s)).toBe("gyro: length x (mm)");
    expect(pathLabel("elements[0].bowUm.tol", s)).toBe("board: bow: ± tolerance (µm)");
    expect(pathLabel("requirements[1].yield")).toBe("requirement 2: yield target (%)");
    expect(fieldLabel("axisTol[2].tol")).toBe("axis angle g3: ± tolerance (°)");
    expect(fieldLabel("placementTol.yawDeg.mean")).toBe("placement rotation: mean shift (°)");
    expect(fieldLabel("bondLine.supports[1].y")).toBe("support point 2 y (mm)");
    expect(readableMessage("the bond-line thickness (um) must be greater than 0")).toBe(
      "the bond-line thickness (µm) must be greater than 0",
    );
    expect(readableMessage('duplicate id "gyro": elements[3] already uses it', s)).toBe('duplicate id "gyro": "gyro" already uses it');
    expect(readableMessage("the length size.x (mm) must be greater than 0")).toBe("the length x (mm) must be greater than 0");
  });

  it("the list of problems shows no path and no unit word", () => {
    const s = stack();
    (s.elements[5].bondLine as { thicknessUm: number }).thicknessUm = -1;
    s.elements[3].size.x = 0;
    (s.elements[4] as { axisTol: unknown }).axisTol = [{ dist: "normal", tol: 1 }];
    const doc: EditorDoc = { stack: s, requirements: [] };
    const issues = indexIssues(validateDoc(doc));
    render(
      <Harness initial={doc}>
        <ProblemList issues={issues} doc={doc} onSelect={() => undefined} saving />
      </Harness>,
    );
    const text = screen.getByRole("region", { name: "Problems" }).textContent ?? "";
    expect(text).toContain("bond-line thickness (µm)");
    expect(text).toContain("length x (mm)");
    expect(text).not.toMatch(/elements\[|\bum\b|thicknessUm|size\.x|axisTol/);
  });

  it("names the places of study settings, what-if and as-built bodies in words, never as the API's path", () => {
    const s = stack();
    expect(placeLabel("study.tilts[1].pitchDeg")).toBe("attitude 2: pitch (°)");
    expect(placeLabel("study.calibration.residualDeg.tol")).toBe("calibration: residual (°): ± tolerance");
    expect(placeLabel("values.3")).toBe("value 4");
    expect(placeLabel("free.0")).toBe("free source 1");
    expect(placeLabel("bounds.mag.bondLine")).toBe("bounds of mag.bondLine");
    expect(placeLabel("asBuilt[2].datasetId")).toBe("measured source 3: data set");
    expect(placeLabel("site.latitudeDeg")).toBe("site: latitude (°)");
    expect(placeLabel("study.requirements[0].yield")).toBe("requirement 1: yield target (%)");
    expect(placeLabel("stack.elements[5].size.z", s)).toBe("mag: thickness z (mm)");
    // a key no table knows still reads as words, its unit as a symbol
    expect(placeLabel("study.someNewLimitUm")).toBe("some new limit (µm)");
    expect(fieldProblemText({ path: "values.1", message: "a tolerance must be greater than 0" })).toBe(
      "Value 2: a tolerance must be greater than 0",
    );
    expect(fieldProblemText({ path: "study.elements[5].bondLine.thicknessUm", message: "must be at least 1 um" })).not.toMatch(
      /elements\[|\bum\b|thicknessUm/,
    );
  });
});
