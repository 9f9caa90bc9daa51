/**
 * Help for entering a stack (issue 14): typical tolerances, stack templates and the
 * geometry warnings a revision carries.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { compileModel, metricIds } from "@shared/engine/model";
import { StackFileSchema, ToleranceSchema, validateStackFile, type StackFile } from "@shared/schemas/stack-file";
import { TypicalTolerancesResponseSchema, StackTemplatesResponseSchema } from "@shared/schemas/stack-help";
import { validateStudy, type StudyFile } from "@shared/schemas/study-file";
import { geometryWarnings, overlapDepth, footprintCorners } from "@shared/stack-geometry";
import { STACK_TEMPLATES } from "@shared/stack-templates";
import { TYPICAL_KINDS, typicalForSlot } from "@shared/typical-tolerances";
import { startTestApp, type TestApp } from "./harness";

let t: TestApp;
let engineer: string;
let projectId: string;

beforeAll(async () => {
  t = await startTestApp();
  engineer = await t.signIn("engineer@example.com");
  const p = await t.call("POST", "/api/projects", { cookie: engineer, body: { name: "Stack help tests" } });
  projectId = p.body.id;
});
afterAll(() => t?.close());

const STUDY: StudyFile = { format: "orthostack.study/1", trials: 100, seed: 1, inclinationDeg: 60 };

/** A board 20 × 20 mm with a 2 × 2 mm substrate in the middle and the given dies on it. */
function onSubstrate(dies: { id: string; x: number; y: number; sx: number; sy: number; yaw?: number }[]): StackFile {
  return {
    format: "orthostack.stack/1",
    elements: [
      { id: "board", kind: "board", parent: null, size: { x: 20, y: 20, z: 1 } },
      { id: "pkg", kind: "substrate", parent: "board", size: { x: 2, y: 2, z: 0.2 } },
      ...dies.map((d) => ({
        id: d.id,
        kind: "asic" as const,
        parent: "pkg",
        position: { x: d.x, y: d.y },
        ...(d.yaw !== undefined ? { yawDeg: d.yaw } : {}),
        size: { x: d.sx, y: d.sy, z: 0.2 },
      })),
    ],
  };
}
const mmIn = (message: string) => Number(/(-?[\d.]+) mm/.exec(message)?.[1]);

describe("typical tolerances", () => {
  it("GET /api/typical-tolerances lists every kind of source, each with a basis and a note", async () => {
    const r = await t.call("GET", "/api/typical-tolerances", { cookie: engineer });
    expect(r.status).toBe(200);
    const { typical } = TypicalTolerancesResponseSchema.parse(r.body);
    expect(new Set(typical.map((x) => x.kind))).toEqual(new Set(TYPICAL_KINDS));
    const has = (kind: string, appliesTo: string) => typical.some((x) => x.kind === kind && x.appliesTo === appliesTo);
    // die-attach height and solder stand-off; board and substrate bow; placement on both levels
    for (const [k, a] of [
      ["bondLine.heightTol", "die-attach"],
      ["bondLine.heightTol", "solder"],
      ["bowUm", "board"],
      ["bowUm", "substrate"],
      ["placementTol.xUm", "die-attach"],
      ["placementTol.yawDeg", "solder"],
      ["axisTol", "gyro"],
      ["axisTol", "accel"],
      ["axisTol", "mag"],
      ["calibration.residualDeg", "calibration"],
    ])
      expect(has(k, a), `${k} for ${a}`).toBe(true);
    for (const x of typical) {
      expect(x.basis).toBe("common practice");
      expect(x.note.length).toBeGreaterThan(20);
      expect(x.tol).toBeGreaterThan(0);
      // each is a tolerance the stack file accepts
      expect(ToleranceSchema.safeParse({ dist: x.dist, tol: x.tol }).success).toBe(true);
    }
    // no two entries for the same source and group
    expect(new Set(typical.map((x) => `${x.kind}/${x.appliesTo}`)).size).toBe(typical.length);
  });

  it("picks the value of the element's place: solder under a package, die attach under a die, the axis of the sensor kind", () => {
    const pkg = { kind: "substrate" as const, parent: "board" };
    const die = { kind: "mag" as const, parent: "asic" };
    expect(typicalForSlot(pkg, ["bondLine", "heightTol"], "board")?.appliesTo).toBe("solder");
    expect(typicalForSlot(die, ["bondLine", "heightTol"], "asic")?.appliesTo).toBe("die-attach");
    expect(typicalForSlot(die, ["axisTol", 2], "asic")?.appliesTo).toBe("mag");
    expect(typicalForSlot(pkg, ["axisTol"], "board")).toBeUndefined();
    expect(typicalForSlot(pkg, ["bowUm"], "board")?.appliesTo).toBe("substrate");
    expect(typicalForSlot({ kind: "board", parent: null }, ["bowUm"])?.appliesTo).toBe("board");
    expect(typicalForSlot({ kind: "board", parent: null }, ["placementTol", "xUm"])).toBeUndefined();
    expect(typicalForSlot(die, ["tiltTol", "x"], "asic")?.unit).toBe("deg");
  });
});

describe("stack templates", () => {
  it("GET /api/stack-templates gives at least three arrangements", async () => {
    const r = await t.call("GET", "/api/stack-templates", { cookie: engineer });
    expect(r.status).toBe(200);
    const { templates } = StackTemplatesResponseSchema.parse(r.body);
    expect(templates.length).toBeGreaterThanOrEqual(3);
    expect(templates.map((x) => x.id)).toEqual(STACK_TEMPLATES.map((x) => x.id));
    expect(new Set(templates.map((x) => x.name)).size).toBe(templates.length);
  });

  for (const tpl of STACK_TEMPLATES) {
    it(`"${tpl.name}": a valid stack the engine compiles, with typical tolerances, requirements on its metrics and no geometry warning`, async () => {
      const v = validateStackFile(JSON.parse(JSON.stringify(tpl.stack)));
      expect(v.ok ? [] : v.issues).toEqual([]);
      expect(StackFileSchema.safeParse(tpl.stack).success).toBe(true);
      const model = compileModel(tpl.stack, STUDY);
      expect(model.metrics.length).toBeGreaterThan(0);
      // three sensor kinds and a compass pair in every template
      const kinds = tpl.stack.elements.map((e) => e.kind);
      for (const k of ["gyro", "accel", "mag"] as const) expect(kinds).toContain(k);
      expect(metricIds(tpl.stack, {})).toContain("heading.maxAbsDeg");
      // requirements: a study with them is accepted against this stack
      expect(tpl.requirements.length).toBeGreaterThanOrEqual(3);
      const study = validateStudy({ ...STUDY, requirements: tpl.requirements }, tpl.stack);
      expect(study.ok ? [] : study.issues).toEqual([]);
      // every tolerance present is the typical one of its place
      const byId = new Map(tpl.stack.elements.map((e) => [e.id, e] as const));
      for (const e of tpl.stack.elements) {
        const parentKind = e.parent ? byId.get(e.parent)?.kind : undefined;
        for (const slot of [["bondLine", "heightTol"], ["placementTol", "xUm"], ["placementTol", "yawDeg"], ["bowUm"], ["axisTol"]]) {
          const tol = slot.reduce<unknown>((o, k) => (o as Record<string, unknown> | undefined)?.[k], e);
          const typ = typicalForSlot(e, slot, parentKind);
          if (typ) expect(tol, `${e.id}.${slot.join(".")}`).toEqual({ dist: typ.dist, tol: typ.tol });
          else expect(tol).toBeUndefined();
        }
      }
      expect(geometryWarnings(tpl.stack)).toEqual([]);
      // and the server takes it as a revision as it is
      const r = await t.call("POST", `/api/projects/${projectId}/revisions`, {
        cookie: engineer,
        body: { stack: tpl.stack, requirements: tpl.requirements },
      });
      expect(r.status).toBe(201);
      expect(r.body.warnings).toEqual([]);
    });
  }
});

describe("geometry warnings", () => {
  it("overlap with yaw: separating axes, not bounding boxes", () => {
    // Two 0.5 mm squares turned 45°, centres 0.5·√2 = 0.707 mm apart on the diagonal: each
    // reaches 0.25 mm along it, so they stand apart, while their bounding boxes overlap.
    const apart = onSubstrate([
      { id: "a", x: -0.45, y: -0.45, sx: 0.5, sy: 0.5, yaw: 45 },
      { id: "b", x: 0.05, y: 0.05, sx: 0.5, sy: 0.5, yaw: 45 },
    ]);
    expect(geometryWarnings(apart)).toEqual([]);
    // Unit squares at x = -0.5 and 0.6: 0.1 mm apart unturned; a turned 45° reaches
    // x = -0.5 + √2/2 = 0.207, past b's left edge at 0.1.
    const pair = (yaw: number) =>
      onSubstrate([
        { id: "a", x: -0.5, y: 0, sx: 1, sy: 1, yaw },
        { id: "b", x: 0.6, y: 0, sx: 1, sy: 1 },
      ]);
    const overlaps = (s: StackFile) => geometryWarnings(s).filter((w) => w.message.includes("overlaps"));
    expect(overlaps(pair(0))).toEqual([]);
    const ws = overlaps(pair(45));
    expect(ws.map((w) => w.path)).toEqual(["elements[2].position", "elements[3].position"]);
    expect(mmIn(ws[0].message)).toBeCloseTo(-0.5 + Math.SQRT1_2 - 0.1, 3);
    expect(ws[0].message).toMatch(/"a" overlaps "b" on "pkg"/);
    expect(ws[1].message).toMatch(/"b" overlaps "a" on "pkg"/);
  });

  it("overlap depth of two squares on the diagonal, by hand", () => {
    const a = footprintCorners({ size: { x: 1, y: 1, z: 1 }, position: { x: 0, y: 0 }, yawDeg: 45 });
    const b = footprintCorners({ size: { x: 1, y: 1, z: 1 }, position: { x: 0.85, y: 0.85 }, yawDeg: 45 });
    // along the diagonal: a spans ±0.5, b's centre is at 0.85·√2 = 1.202, so they are 0.202 apart
    expect(overlapDepth(a, b)).toBe(0);
    const c = footprintCorners({ size: { x: 1, y: 1, z: 1 }, position: { x: 0.5, y: 0.5 }, yawDeg: 45 });
    // centre at 0.707 on the diagonal: overlap 0.5 + 0.5 - 0.707 = 0.293
    expect(overlapDepth(a, c)).toBeCloseTo(1 - Math.SQRT2 / 2, 9);
  });

  it("overhang past the parent's top face counts the yaw", () => {
    const straight = onSubstrate([{ id: "die", x: 0, y: 0, sx: 1.6, sy: 1.6 }]);
    expect(geometryWarnings(straight)).toEqual([]);
    const turned = onSubstrate([{ id: "die", x: 0, y: 0, sx: 1.6, sy: 1.6, yaw: 45 }]);
    const [w] = geometryWarnings(turned);
    expect(w.path).toBe("elements[2].position");
    expect(w.message).toMatch(/hangs .* past the edge of its parent "pkg"/);
    // the corner reaches 0.8·√2 = 1.131 mm from the centre of a face 1 mm from centre to edge
    expect(mmIn(w.message)).toBeCloseTo(0.8 * Math.SQRT2 - 1, 3);
  });

  it("clearance to the parent's edge below the set value, and the stack's own value", () => {
    const close = onSubstrate([{ id: "die", x: 0.45, y: 0, sx: 1, sy: 1 }]);
    const [w] = geometryWarnings(close);
    expect(w.path).toBe("elements[2].position");
    expect(w.message).toMatch(/is 0\.05 mm from the edge of "pkg"; keep at least 0\.1 mm/);
    expect(geometryWarnings({ ...close, meta: { edgeClearanceMm: 0.04 } })).toEqual([]);
    // a package near the board's edge: the board's keep-out
    const nearEdge: StackFile = {
      format: "orthostack.stack/1",
      elements: [
        { id: "board", kind: "board", parent: null, size: { x: 20, y: 20, z: 1 } },
        { id: "pkg", kind: "substrate", parent: "board", position: { x: 8.8, y: 0 }, size: { x: 2, y: 2, z: 0.2 } },
      ],
    };
    expect(geometryWarnings(nearEdge).map((x) => [x.path, mmIn(x.message)])).toEqual([["elements[1].position", 0.2]]);
  });

  it("dies taller than the package body, when the body height is given", () => {
    const s = onSubstrate([{ id: "die", x: 0, y: 0, sx: 1, sy: 1 }]);
    s.elements[2].bondLine = { thicknessUm: 50 };
    s.elements.push({ id: "top", kind: "mag", parent: "die", size: { x: 0.5, y: 0.5, z: 0.3 }, bondLine: { thicknessUm: 10 } });
    expect(geometryWarnings(s)).toEqual([]);
    // substrate 0.2 + 0.05 + 0.2 + 0.01 + 0.3 = 0.76 mm
    s.elements[1].meta = { bodyHeightMm: 0.7 };
    const ws = geometryWarnings(s);
    expect(ws.map((w) => w.path)).toEqual(["elements[3].size.z"]);
    expect(ws[0].message).toContain("0.76 mm");
    s.elements[1].meta = { bodyHeightMm: 0.8 };
    expect(geometryWarnings(s)).toEqual([]);
  });

  it("a revision carries its warnings and is saved all the same", async () => {
    const stack = onSubstrate([
      { id: "a", x: -0.3, y: 0, sx: 1, sy: 1 },
      { id: "b", x: 0.3, y: 0, sx: 1, sy: 1, yaw: 10 },
    ]);
    const r = await t.call("POST", `/api/projects/${projectId}/revisions`, { cookie: engineer, body: { stack } });
    expect(r.status).toBe(201);
    const paths = r.body.warnings.map((w: { path: string }) => w.path);
    expect(paths).toEqual(expect.arrayContaining(["elements[2].position", "elements[3].position"]));
    const got = await t.call("GET", `/api/revisions/${r.body.id}`, { cookie: engineer });
    expect(got.body.warnings).toEqual(r.body.warnings);
    // fixed: the warnings go
    stack.elements[3].position = { x: 0.45, y: 0.45 };
    stack.elements[3].size = { x: 0.5, y: 0.5, z: 0.2 };
    stack.elements[2].position = { x: -0.45, y: -0.45 };
    stack.elements[2].size = { x: 0.8, y: 0.8, z: 0.2 };
    const patched = await t.call("PATCH", `/api/revisions/${r.body.id}`, {
      cookie: engineer,
      body: { stack },
      headers: { "if-match": r.headers.get("etag")! },
    });
    expect(patched.status).toBe(200);
    expect(patched.body.warnings).toEqual([]);
  });
});
