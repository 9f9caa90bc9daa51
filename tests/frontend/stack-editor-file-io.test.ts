import { describe, expect, it } from "vitest";
import reference from "../fixtures/stack-reference.json" with { type: "json" };
import { readStackFileText, stackFileName, stackFileText } from "@frontend/features/stack-files";

describe("stack files in and out of the editor", () => {
  it("imports the reference stack and exports it unchanged", () => {
    const r = readStackFileText(JSON.stringify(reference));
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(JSON.parse(stackFileText(r.stack))).toEqual(reference);
    expect(stackFileText(r.stack).endsWith("}\n")).toBe(true);
  });

  it("refuses text that is not JSON, and names the element of each problem", () => {
    const notJson = readStackFileText("{ elements: ");
    expect(notJson.ok).toBe(false);
    if (!notJson.ok) expect(notJson.message).toMatch(/^The file is not JSON/);

    const broken = structuredClone(reference) as { elements: { id: string; size: { x: number }; parent: string | null }[] };
    broken.elements[5].size.x = -1;
    broken.elements[2].parent = "nowhere";
    const r = readStackFileText(JSON.stringify(broken));
    expect(r.ok).toBe(false);
    if (r.ok) return;
    expect(r.message).toBe("The file has 2 problems; nothing was imported.");
    expect(r.issues.map((i) => [i.element, i.path])).toEqual(
      expect.arrayContaining([
        ["mag", "elements[5].size.x"],
        ["asic", "elements[2].parent"],
      ]),
    );
  });

  it("names the download after the stack and the revision", () => {
    expect(stackFileName("Ridgeline 9-axis module, LGA 3.0 × 3.0", 2)).toBe("Ridgeline-9-axis-module-LGA-3.0-3.0-rev2.stack.json");
    expect(stackFileName(undefined, 1)).toBe("stack-rev1.stack.json");
  });
});
