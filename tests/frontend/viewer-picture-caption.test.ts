import { describe, expect, it } from "vitest";
import type { StackFile } from "@shared/schemas/stack-file";
import { PICTURE_FACTOR, snapshotCaption, type SnapshotInput } from "@frontend/features/viewer3d/hooks/use-snapshot-export";

const input = (over: Partial<SnapshotInput> = {}): SnapshotInput => ({
  stack: { name: "Trail watch module" } as StackFile,
  revisionLabel: "revision 3",
  poseLabel: "Nominal pose (design intent)",
  choice: { kind: "nominal" },
  exaggeration: 50,
  explode: 0,
  section: { axis: "off", value: 0, flip: false },
  kinds: ["board"],
  showSensingAxes: false,
  ...over,
});
const view = { width: 2400, height: 1300, azimuthDeg: 311.4, elevationDeg: 30.6, pxPerMm: 234.2 };

describe("the saved 3D picture's caption", () => {
  it("names the stack, the revision, the pose, the view and its scale, and the date", () => {
    const c = snapshotCaption(input(), view, new Date("2026-12-02T15:00:00Z"));
    expect(c.title).toBe("Trail watch module, revision 3: Nominal pose (design intent)");
    expect(c.lines[0]).toBe(
      "View from azimuth 311°, elevation 31° (board frame B, z up); scale 234 px per mm at the centre of view (perspective); lengths true to scale, angles ×50",
    );
    expect(c.lines[1]).toBe(`Orthostack 3D view, 2026-12-02; 2400 × 1300 px (${PICTURE_FACTOR}× the view on screen)`);
    expect(PICTURE_FACTOR).toBe(2);
  });

  it("adds the explode gap and the section when they are on, and leaves out a missing revision", () => {
    const c = snapshotCaption(
      input({ revisionLabel: undefined, explode: 0.4, section: { axis: "x", value: 1.25, flip: false } }),
      view,
      new Date("2026-12-02T15:00:00Z"),
    );
    expect(c.title).toBe("Trail watch module: Nominal pose (design intent)");
    expect(c.lines[0]).toMatch(/; exploded 0\.4\d* mm per level; section x [≤<]=? ?1\.25\d* mm$/);
  });
});
