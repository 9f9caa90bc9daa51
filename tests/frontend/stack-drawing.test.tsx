import { useMemo, useState } from "react";
import { cleanup, fireEvent, render, screen, within } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { validateStackFile, type StackFile } from "@shared/schemas/stack-file";
import { geometryWarnings } from "@shared/stack-geometry";
import { PALETTE } from "@shared/palette";
import reference from "../fixtures/stack-reference.json" with { type: "json" };
import { EditorContext, type EditorApi } from "@frontend/features/stack-editor/components/editor-context";
import { StackDrawing } from "@frontend/features/stack-editor/components/stack-drawing";
import { indexIssues, validateDoc } from "@frontend/features/stack-editor/lib/issues";

vi.setConfig({ testTimeout: 30_000 });
afterEach(cleanup);

let selected: string | null = null;

function Harness({ stack }: { stack: StackFile }) {
  const [selectedId, select] = useState<string | null>("gyro");
  selected = selectedId;
  const doc = useMemo(() => ({ stack, requirements: [] }), [stack]);
  const v = validateStackFile(stack);
  const api: EditorApi = {
    doc,
    readOnly: true,
    issues: indexIssues(validateDoc(doc)),
    update: () => {},
    setAt: () => {},
    selectedId,
    select,
    suppliers: [],
    warnings: indexIssues(v.ok ? geometryWarnings(v.stack) : []).elements,
  };
  return (
    <EditorContext.Provider value={api}>
      <StackDrawing stack={v.ok ? v.stack : null} revisionNumber={3} />
    </EditorContext.Provider>
  );
}

const stack = () => structuredClone(reference) as unknown as StackFile;
/** CSS pixels per millimetre at a drafting scale (96 px to the inch). */
const px = (mm: number, scale: number) => (mm * scale * 96) / 25.4;
const lineLength = (g: Element) => {
  const l = g.querySelector("line")!;
  const n = (a: string) => Number(l.getAttribute(a));
  return Math.hypot(n("x2") - n("x1"), n("y2") - n("y1"));
};

describe("the stack's drawing in the editor", () => {
  it("draws the top view to scale with its balloons, positions and the package's dimensions", () => {
    render(<Harness stack={stack()} />);
    const top = screen.getByRole("figure", { name: "Top view of the stack" });
    // the 3 mm package in a 460 × 320 px view: 20:1 makes it 227 px, 50:1 would not fit
    const svg = within(top).getByRole("img", { name: "Top view at 20:1" });
    expect(svg.textContent).toContain("Top view, looking down on the board · scale 20:1 on screen at 100 % zoom");
    const pkg = svg.querySelector('[data-element="pkg"] polygon')!;
    const xs = pkg
      .getAttribute("points")!
      .split(" ")
      .map((p) => Number(p.split(",")[0]));
    expect(Math.max(...xs) - Math.min(...xs)).toBeCloseTo(px(3, 20), 6);
    // every element above the board, numbered in stack order
    expect([...svg.querySelectorAll("[data-element]")].map((g) => g.getAttribute("data-element"))).toEqual([
      "pkg",
      "asic",
      "gyro",
      "accel",
      "mag",
    ]);
    expect([...svg.querySelectorAll("circle")].map((c) => c.nextElementSibling?.textContent)).toEqual(["1", "2", "3", "4", "5"]);
    // the package's length and width, dimensioned at their true length on the drawing
    const length = svg.querySelector('[data-dimension="length"]')!;
    expect(length.textContent).toBe("3.000 mm");
    expect(lineLength(length)).toBeCloseTo(px(3, 20), 6);
    expect(svg.querySelector('[data-dimension="width"]')!.textContent).toBe("3.000 mm");
    // the positions beside it: the magnetometer sits 0.05 mm off the accelerometer's centre, turned 90°
    const positions = screen.getByRole("list", { name: "Positions on the parent" });
    const mag = within(positions).getAllByRole("listitem")[4];
    expect(mag.textContent).toBe("5  mag, 0.900 × 0.500 mm" + "x 0.000, y 0.050 mm from accel's centre; yaw 90.000°");
  });

  it("draws the side section with thicknesses, bond lines and the overall height", () => {
    render(<Harness stack={stack()} />);
    const side = screen.getByRole("figure", { name: "Side section of the stack" });
    const svg = within(side).getByRole("img", { name: "Side section at 20:1" });
    // 55 + 20 + 15 + 12 + 10 µm of bond line and 0.22 + 0.15 + 0.30 + 0.25 + 0.15 mm of parts
    const height = svg.querySelector('[data-dimension="height"]')!;
    expect(height.textContent).toBe("1.182 mm");
    expect(lineLength(height)).toBeCloseTo(px(1.182, 20), 6);
    // labels from the top element down
    const labels = [...svg.querySelectorAll("[data-label]")].map((g) => g.getAttribute("data-label"));
    expect(labels).toEqual(["mag", "accel", "gyro", "asic", "pkg"]);
    expect(svg.querySelector('[data-label="mag"]')!.textContent).toBe(
      "mag 0.150 mm thick on 10.0 µm bond line" + "bottom at 1.032 mm, top at 1.182 mm",
    );
    // each bond line drawn under its element, at its thickness (55 µm under the package)
    const bond = svg.querySelector('[data-bond-line="pkg"]')!;
    expect(Number(bond.getAttribute("height"))).toBeCloseTo(px(0.055, 20), 6);
    expect(svg.querySelectorAll("[data-bond-line]")).toHaveLength(5);
  });

  it("outlines elements with a geometry warning and selects an element when clicked", () => {
    render(<Harness stack={stack()} />);
    const svg = within(screen.getByRole("figure", { name: "Top view of the stack" })).getByRole("img");
    // the reference ASIC keeps only 0.05 mm to the package's edge (a clearance warning)
    expect(svg.querySelector('[data-element="asic"] polygon')!.getAttribute("stroke")).toBe(PALETTE.warn);
    expect(svg.querySelector('[data-element="accel"] polygon')!.getAttribute("stroke")).toBe(PALETTE.accel);
    fireEvent.click(svg.querySelector('[data-element="mag"]')!);
    expect(selected).toBe("mag");
  });

  it("follows the stack: a turned package loses its length and width, a thicker die raises the height", () => {
    const s = stack();
    s.elements.find((e) => e.id === "pkg")!.yawDeg = 30;
    s.elements.find((e) => e.id === "mag")!.size.z = 0.35;
    render(<Harness stack={s} />);
    expect(document.querySelector('[data-dimension="length"]')).toBeNull();
    expect(document.querySelector('[data-dimension="height"]')!.textContent).toBe("1.382 mm");
  });

  it("says why there is no drawing while the stack has problems", () => {
    const s = stack();
    s.elements[1].size.x = -1;
    render(<Harness stack={s} />);
    expect(screen.getByText("The drawing shows once the stack has no problems.")).toBeTruthy();
  });
});
