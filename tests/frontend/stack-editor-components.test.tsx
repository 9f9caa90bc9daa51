import { useMemo, useState, type ReactNode } from "react";
import { act, cleanup, fireEvent, render, screen, within } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { validateStackFile, type StackFile } from "@shared/schemas/stack-file";
import { geometryWarnings } from "@shared/stack-geometry";
import reference from "../fixtures/stack-reference.json" with { type: "json" };
import { EditorContext, type EditorApi } from "@frontend/features/stack-editor/components/editor-context";
import { ElementForm } from "@frontend/features/stack-editor/components/element-form";
import { ElementTree } from "@frontend/features/stack-editor/components/element-tree";
import { ToleranceTable } from "@frontend/features/stack-editor/components/tolerance-table";
import { useEditorHistory } from "@frontend/features/stack-editor/hooks/use-editor-history";
import { indexIssues, validateDoc } from "@frontend/features/stack-editor/lib/issues";
import type { EditorDoc } from "@frontend/features/stack-editor/lib/stack-ops";

// The whole element form renders many controls; a busy CI machine needs more than the default 5 s.
vi.setConfig({ testTimeout: 30_000 });
afterEach(cleanup);

const SUPPLIERS = ["Fenmoor Substrates", "Larkfield Assembly", "Quillon Boardworks"];
let latest: EditorDoc;
let undoLatest: () => void;

/** The editor's context over a real history, as the editor page builds it. */
function Harness({
  initial,
  children,
  readOnly = false,
  selected = "mag",
}: {
  initial: EditorDoc;
  children: ReactNode;
  readOnly?: boolean;
  selected?: string;
}) {
  const { doc, update, setAt, undo } = useEditorHistory(initial);
  const [selectedId, select] = useState<string | null>(selected);
  const issues = useMemo(() => indexIssues(validateDoc(doc)), [doc]);
  latest = doc;
  undoLatest = undo;
  const warnings = useMemo(() => {
    const v = validateStackFile(doc.stack);
    return indexIssues(v.ok ? geometryWarnings(v.stack) : []).elements;
  }, [doc]);
  const api: EditorApi = { doc, readOnly, issues, update, setAt, selectedId, select, suppliers: SUPPLIERS, warnings };
  return <EditorContext.Provider value={api}>{children}</EditorContext.Provider>;
}

const doc = (): EditorDoc => ({ stack: structuredClone(reference) as unknown as StackFile, requirements: [] });
const magIndex = 5;

describe("the element form", () => {
  it("writes typed numbers into the stack and shows the validator's message at the field", () => {
    render(
      <Harness initial={doc()}>
        <ElementForm index={magIndex} />
      </Harness>,
    );
    const length = screen.getByLabelText("Length x") as HTMLInputElement;
    expect(length.value).toBe("0.9");
    fireEvent.change(length, { target: { value: "0" } });
    expect(latest.stack.elements[magIndex].size.x).toBe(0);
    expect(screen.getByText("The length x (mm) must be greater than 0")).toBeTruthy();
    expect(length.getAttribute("aria-invalid")).toBe("true");

    // Text that is not a number yet stays in the box and is not sent on.
    fireEvent.change(length, { target: { value: "1.2.3" } });
    expect(screen.getByText("Enter a number")).toBeTruthy();
    expect(latest.stack.elements[magIndex].size.x).toBe(0);
    fireEvent.change(length, { target: { value: "1,25" } });
    expect(latest.stack.elements[magIndex].size.x).toBe(1.25);
    expect(screen.queryByText("Enter a number")).toBeNull();
  });

  it("adds and removes a tolerance; absent means zero", () => {
    render(
      <Harness initial={doc()}>
        <ElementForm index={magIndex} />
      </Harness>,
    );
    expect(latest.stack.elements[magIndex].tiltTol).toBeUndefined();
    fireEvent.click(screen.getByRole("button", { name: "Add tilt about x tolerance" }));
    // a new tolerance starts from the typical value of its place (a die on a die), never ±0
    expect(latest.stack.elements[magIndex].tiltTol).toEqual({ x: { dist: "normal", tol: 0.1 } });
    const group = screen.getByRole("group", { name: "Tilt about x tolerance" });
    fireEvent.change(within(group).getByLabelText("± Tolerance"), { target: { value: "0.05" } });
    fireEvent.change(within(group).getByLabelText("Distribution"), { target: { value: "uniform" } });
    expect(latest.stack.elements[magIndex].tiltTol?.x).toEqual({ dist: "uniform", tol: 0.05 });
    expect(within(group).queryByLabelText("Sigmas")).toBeNull(); // sigmas belongs to normal tolerances only
    fireEvent.click(within(group).getByRole("button", { name: "Remove tilt about x tolerance" }));
    expect(latest.stack.elements[magIndex].tiltTol).toBeUndefined();
  });

  it("shows the typical range beside a tolerance and puts it back on request", () => {
    render(
      <Harness initial={doc()}>
        <ElementForm index={magIndex} />
      </Harness>,
    );
    // the reference magnetometer's axis alignment is ±0.6°; a magnetometer die is typically ±1°
    const axis = screen.getByRole("group", { name: "Axis alignment, each angle tolerance" });
    expect(within(axis).getByText("typical ±1°")).toBeTruthy();
    const bond = screen.getByRole("group", { name: "Height of each support tolerance" });
    expect(within(bond).getByText("typical ±5 µm")).toBeTruthy();
    fireEvent.change(within(axis).getByLabelText("Mean shift"), { target: { value: "0.2" } });
    fireEvent.click(within(axis).getByRole("button", { name: /Use the typical value for magnetometer sensing-axis alignment/ }));
    expect(latest.stack.elements[magIndex].axisTol).toEqual({ dist: "normal", tol: 1 });
    // once typical, the button goes
    expect(within(axis).queryByRole("button", { name: /Use the typical value/ })).toBeNull();
  });

  it("shows a geometry warning next to the element it belongs to", () => {
    const d = doc();
    // the magnetometer (0.9 × 0.5 mm, turned 90°: 0.25 mm either side in x) moved to x = 0.4 on
    // the 1.1 mm wide accelerometer reaches 0.65 mm, 0.1 mm past its 0.55 mm edge
    d.stack.elements[magIndex].position = { x: 0.4, y: 0 };
    render(
      <Harness initial={d}>
        <ElementForm index={magIndex} />
      </Harness>,
    );
    const list = screen.getByRole("list", { name: "Geometry warnings of mag" });
    expect(list.textContent).toMatch(/"mag" hangs 0\.1 mm past the edge of its parent "accel"/);
  });

  it("renames an element only when the new id is complete and free", () => {
    render(
      <Harness initial={{ ...doc(), requirements: [{ metric: "accel~mag.relRotDeg", max: 0.5, yield: 0.99 }] }}>
        <ElementForm index={magIndex} />
      </Harness>,
    );
    const id = screen.getByLabelText("Id") as HTMLInputElement;
    fireEvent.change(id, { target: { value: "accel" } });
    expect(screen.getByText('Another element already has the id "accel"')).toBeTruthy();
    fireEvent.blur(id);
    expect(latest.stack.elements[magIndex].id).toBe("mag");
    fireEvent.change(id, { target: { value: "compass" } });
    fireEvent.keyDown(id, { key: "Enter" });
    expect(latest.stack.elements[magIndex].id).toBe("compass");
    expect(latest.requirements[0].metric).toBe("accel~compass.relRotDeg");
  });

  it("switches the axis alignment between one tolerance and six", () => {
    render(
      <Harness initial={doc()}>
        <ElementForm index={magIndex} />
      </Harness>,
    );
    const one = latest.stack.elements[magIndex].axisTol;
    fireEvent.click(screen.getByRole("radio", { name: "Six tolerances, g1 to g6" }));
    expect(latest.stack.elements[magIndex].axisTol).toEqual(Array.from({ length: 6 }, () => one));
    expect(screen.getAllByRole("group", { name: /^Angle g\d/ })).toHaveLength(6);
    fireEvent.click(screen.getByRole("radio", { name: "One tolerance, six angles" }));
    expect(latest.stack.elements[magIndex].axisTol).toEqual(one);
  });
});

describe("the tolerance table", () => {
  it("edits a source in place, the owner from the supplier companies or as free text", () => {
    render(
      <Harness initial={doc()}>
        <ToleranceTable />
      </Harness>,
    );
    const table = screen.getByRole("table", { name: "Tolerance sources" });
    fireEvent.change(within(table).getByLabelText("mag.bondLine tolerance"), { target: { value: "7" } });
    expect(latest.stack.elements[magIndex].bondLine?.heightTol?.tol).toBe(7);
    fireEvent.change(within(table).getByLabelText("mag.bondLine owner"), { target: { value: "Larkfield Assembly" } });
    expect(latest.stack.elements[magIndex].bondLine?.heightTol?.owner).toBe("Larkfield Assembly");
    fireEvent.change(within(table).getByLabelText("mag.bondLine owner"), { target: { value: "\u0000other" } });
    expect(latest.stack.elements[magIndex].bondLine?.heightTol?.owner).toBeUndefined();
    fireEvent.change(within(table).getByLabelText("mag.bondLine owner: in-house step"), { target: { value: "Die attach, line 2" } });
    expect(latest.stack.elements[magIndex].bondLine?.heightTol?.owner).toBe("Die attach, line 2");
    fireEvent.change(within(table).getByLabelText("mag.bondLine stage"), { target: { value: "board" } });
    expect(latest.stack.elements[magIndex].bondLine?.heightTol?.stage).toBe("board");
  });

  it("shows the typical value of each source's place under its tolerance", () => {
    render(
      <Harness initial={doc()}>
        <ToleranceTable />
      </Harness>,
    );
    const table = screen.getByRole("table", { name: "Tolerance sources" });
    const row = (label: string) => within(table).getByLabelText(label).closest("tr")!;
    // a magnetometer die's axes are typically ±1°, its die attach ±5 µm
    expect(row("mag.axis tolerance").textContent).toContain("typical ±1°");
    expect(row("mag.bondLine tolerance").textContent).toContain("typical ±5 µm");
  });

  it("measured data with no half-width turned back into a distribution takes the typical half-width, not ±0", () => {
    const d = doc();
    d.stack.elements[magIndex].bondLine = { ...d.stack.elements[magIndex].bondLine!, heightTol: { dist: "data", values: [9.5, 10, 10.4] } };
    render(
      <Harness initial={d}>
        <ToleranceTable />
      </Harness>,
    );
    fireEvent.change(screen.getByLabelText("mag.bondLine distribution"), { target: { value: "normal" } });
    expect(latest.stack.elements[magIndex].bondLine?.heightTol).toEqual({ dist: "normal", tol: 5 });
  });

  it("sorts by a column and filters, and an undo shows the old value in the box", () => {
    render(
      <Harness initial={doc()}>
        <ToleranceTable />
      </Harness>,
    );
    const table = screen.getByRole("table", { name: "Tolerance sources" });
    const sourceIds = () =>
      within(table)
        .getAllByRole("row")
        .slice(1)
        .map((r) => r.querySelector(".font-mono")?.textContent?.split(" ·")[0]);
    const before = sourceIds();
    fireEvent.click(within(table).getByRole("button", { name: /± Tolerance/ }));
    expect(within(table).getAllByRole("columnheader")[3].getAttribute("aria-sort")).toBe("ascending");
    const asc = sourceIds();
    expect(asc).not.toEqual(before);
    expect([...asc].reverse()).not.toEqual(asc);
    fireEvent.change(screen.getByLabelText("Filter tolerance sources"), { target: { value: "mag." } });
    expect(sourceIds().every((id) => id?.startsWith("mag."))).toBe(true);

    const box = within(table).getByLabelText("mag.bondLine tolerance") as HTMLInputElement;
    const old = box.value;
    fireEvent.change(box, { target: { value: "9" } });
    expect(box.value).toBe("9");
    // undo from outside the box
    act(() => undoLatest());
    expect((within(table).getByLabelText("mag.bondLine tolerance") as HTMLInputElement).value).toBe(old);
  });
});

describe("the element tree", () => {
  it("adds a die on the selected element and removes it again", () => {
    render(
      <Harness initial={doc()} selected="asic">
        <ElementTree />
      </Harness>,
    );
    fireEvent.click(screen.getByRole("button", { name: "Add on asic" }));
    fireEvent.click(screen.getByRole("menuitem", { name: "Spacer" }));
    expect(latest.stack.elements.find((e) => e.id === "spacer")?.parent).toBe("asic");
    const item = screen.getByRole("treeitem", { name: /^spacer, spacer/ });
    expect(item.getAttribute("aria-selected")).toBe("true");
    expect(item.getAttribute("aria-level")).toBe("4");
    fireEvent.click(screen.getByRole("button", { name: "Remove spacer" }));
    expect(latest.stack.elements.some((e) => e.id === "spacer")).toBe(false);
  });

  it("marks each element that has a geometry warning, and only those, as the stack changes", () => {
    const d = doc();
    // mag moved to x = 0.4 on accel hangs 0.1 mm past its edge (see the element form's test above)
    d.stack.elements[magIndex].position = { x: 0.4, y: 0 };
    render(
      <Harness initial={d} selected="asic">
        <ElementTree />
      </Harness>,
    );
    const marked = () =>
      screen
        .getAllByRole("treeitem")
        .filter((li) => li.getAttribute("data-geometry-warnings"))
        .map((li) => li.getAttribute("data-id"))
        .sort();
    // the reference ASIC (2.4 mm wide at x = 0.25 on the 3 mm package) keeps only 0.05 mm to the edge
    expect(marked()).toEqual(["asic", "mag"]);
    expect(screen.getByTestId("geometry-mark-asic").getAttribute("title")).toMatch(/"asic" is 0\.05 mm from the edge of "pkg"/);
    const mag = screen.getByRole("treeitem", { name: /^mag, .*, 1 geometry warning$/ });
    expect(within(mag).getByTestId("geometry-mark-mag").getAttribute("title")).toMatch(
      /"mag" hangs 0\.1 mm past the edge of its parent "accel"/,
    );
    expect(screen.getByRole("treeitem", { name: /^gyro, / }).getAttribute("aria-label")).not.toMatch(/geometry/);

    // a spacer added on the ASIC lands on the gyro's place (the gyro spans x -1.1 to 0.5 mm):
    // both are marked, each with the overlap named from its side
    fireEvent.click(screen.getByRole("button", { name: "Add on asic" }));
    fireEvent.click(screen.getByRole("menuitem", { name: "Spacer" }));
    expect(marked()).toEqual(["asic", "gyro", "mag", "spacer"]);
    expect(screen.getByTestId("geometry-mark-gyro").getAttribute("title")).toMatch(/the footprint of "gyro" overlaps "spacer"/);
    expect(screen.getByTestId("geometry-mark-spacer").getAttribute("title")).toMatch(/the footprint of "spacer" overlaps "gyro"/);

    // removing it again clears both marks
    fireEvent.click(screen.getByRole("button", { name: "Remove spacer" }));
    expect(marked()).toEqual(["asic", "mag"]);
  });

  it("offers no changes when read only", () => {
    render(
      <Harness initial={doc()} readOnly selected="asic">
        <ElementTree />
      </Harness>,
    );
    expect(screen.queryByRole("button", { name: /Add on/ })).toBeNull();
    expect(screen.getAllByRole("treeitem")).toHaveLength(6);
  });
});
