import { describe, expect, it } from "vitest";
import { validateStackFile, toErrorBody, type FieldError } from "@shared/schemas/stack-file";
import { validateStudy } from "@shared/schemas/study-file";
import { ResultFileSchema } from "@shared/schemas/result-file";
import { runStudy } from "@shared/engine/study";
import { compassStack, fixture, referenceStack, stackOf, study, studyOf } from "./helpers";

const base = () => JSON.parse(JSON.stringify(fixture("stack-reference.json")));

function issuesOf(json: unknown): FieldError[] {
  const v = validateStackFile(json);
  if (v.ok) throw new Error("expected the stack to be refused");
  return v.issues;
}

function has(issues: FieldError[], path: string, text: RegExp) {
  expect(
    issues.some((i) => i.path === path && text.test(i.message)),
    JSON.stringify(issues, null, 1),
  ).toBe(true);
}

describe("stack file validation", () => {
  it("accepts the reference stack", () => {
    expect(validateStackFile(fixture("stack-reference.json")).ok).toBe(true);
  });

  it("unknown parent", () => {
    const j = base();
    j.elements[3].parent = "asci";
    has(issuesOf(j), "elements[3].parent", /unknown parent "asci"/);
  });

  it("a cycle", () => {
    const j = base();
    j.elements[2].parent = "accel"; // asic on accel, accel on gyro, gyro on asic
    has(issuesOf(j), "elements[2].parent", /cycle: .*none of them rests on the board/);
  });

  it("no board, and two roots", () => {
    const j = base();
    j.elements[0].parent = "pkg";
    const none = issuesOf(j);
    has(none, "elements", /no board/);
    const k = base();
    k.elements[1].parent = null;
    has(issuesOf(k), "elements[1].parent", /two roots/);
  });

  it("duplicate ids", () => {
    const j = base();
    j.elements[4].id = "gyro";
    has(issuesOf(j), "elements[4].id", /duplicate id "gyro": elements\[3\] already uses it/);
  });

  it("size and thickness must be greater than 0", () => {
    const j = base();
    j.elements[2].size.x = 0;
    j.elements[3].size.z = -0.1;
    j.elements[4].bondLine.thicknessUm = 0;
    const is = issuesOf(j);
    has(is, "elements[2].size.x", /greater than 0/);
    has(is, "elements[3].size.z", /thickness .* greater than 0/);
    has(is, "elements[4].bondLine.thicknessUm", /greater than 0/);
  });

  it("support point outside the footprint, and fewer than three supports", () => {
    const j = base();
    j.elements[5].bondLine.supports = [
      { x: -0.4, y: -0.2 },
      { x: 0.6, y: -0.2 },
      { x: 0, y: 0.2 },
    ];
    has(issuesOf(j), "elements[5].bondLine.supports[1]", /outside the 0\.9 x 0\.5 mm footprint of "mag"/);
    const k = base();
    k.elements[5].bondLine.supports = [
      { x: -0.4, y: -0.2 },
      { x: 0.4, y: -0.2 },
    ];
    has(issuesOf(k), "elements[5].bondLine.supports", /at least three/);
    const c = base();
    c.elements[5].bondLine.supports = [
      { x: -0.4, y: 0 },
      { x: 0, y: 0 },
      { x: 0.4, y: 0 },
    ];
    has(issuesOf(c), "elements[5].bondLine.supports", /one line/);
  });

  it("unknown distribution and sigmas <= 0", () => {
    const j = base();
    j.elements[0].bowUm.dist = "gauss";
    j.elements[1].bondLine.heightTol.sigmas = 0;
    const is = issuesOf(j);
    has(is, "elements[0].bowUm.dist", /unknown distribution "gauss"/);
    has(is, "elements[1].bondLine.heightTol.sigmas", /sigmas must be greater than 0/);
  });

  it("reports every problem of a file at once, also when shapes are broken", () => {
    const j = base();
    j.elements[2].size.x = "wide";
    j.elements[3].parent = "nowhere";
    j.elements[4].id = "mag";
    j.elements[5].bowUM = { dist: "normal", tol: 1 };
    const is = issuesOf(j);
    has(is, "elements[2].size.x", /must be a number/);
    has(is, "elements[3].parent", /unknown parent/);
    has(is, "elements[5].id", /duplicate id "mag"/);
    has(is, "elements[5].bowUM", /unknown field "bowUM"/);
  });

  it("issues map straight onto the API's error body", () => {
    const j = base();
    j.elements[3].parent = "x";
    const body = toErrorBody("invalid_stack", "the stack file is not valid", issuesOf(j));
    expect(body.error.code).toBe("invalid_stack");
    expect(body.error.fields[0]).toEqual({ path: "elements[3].parent", message: expect.stringContaining("unknown parent") });
  });
});

describe("study file validation", () => {
  const ref = referenceStack();
  const studyIssues = (json: unknown, st = ref): FieldError[] => {
    const v = validateStudy(json, st);
    if (v.ok) throw new Error("expected the study to be refused");
    return v.issues;
  };

  it("accepts the reference studies", () => {
    expect(validateStudy(fixture("study-reference.json"), ref).ok).toBe(true);
    expect(validateStudy(fixture("study-reference-calibrated.json"), ref).ok).toBe(true);
  });

  it("trials outside 1..10^7", () => {
    has(studyIssues(study({ trials: 0 })), "trials", /between 1 and 10,000,000/);
    has(studyIssues(study({ trials: 10_000_001 })), "trials", /between 1 and 10,000,000/);
    has(studyIssues(study({ trials: 2.5 })), "trials", /whole number/);
  });

  it("a requirement on a metric the stack does not have", () => {
    const is = studyIssues(
      study({
        requirements: [
          { metric: "magnet.tiltDeg", max: 1, yield: 0.99 },
          { metric: "asic.crossAxisPct.xy", max: 1, yield: 0.99 },
        ],
      }),
    );
    has(is, "requirements[0].metric", /no metric "magnet.tiltDeg": there is no element "magnet"/);
    has(is, "requirements[1].metric", /only sensors have cross-axis/);
  });

  it("heading requested without an accelerometer and a magnetometer", () => {
    const gyroOnly = stackOf({
      format: "orthostack.stack/1",
      elements: [
        { id: "board", kind: "board", parent: null, size: { x: 10, y: 10, z: 1 } },
        { id: "g", kind: "gyro", parent: "board", size: { x: 1, y: 1, z: 0.2 } },
      ],
    });
    has(studyIssues(study({ heading: true }), gyroOnly), "heading", /needs an accelerometer and a magnetometer/);
    has(
      studyIssues(study({ requirements: [{ metric: "heading.maxAbsDeg", max: 1, yield: 0.9 }] }), gyroOnly),
      "requirements[0].metric",
      /needs an accelerometer and a magnetometer/,
    );
    has(studyIssues(study({ headingSensors: { accel: "g", mag: "board" } }), gyroOnly), "headingSensors.accel", /not an accelerometer/);
    // without a heading request, such a stack is fine
    expect(validateStudy(study(), gyroOnly).ok).toBe(true);
  });

  it("sampling, adaptive and calibration options", () => {
    has(studyIssues(study({ sampling: "sobol" })), "sampling", /"random" or "lhs"/);
    has(studyIssues(study({ adaptive: { significantDigits: 3 } })), "adaptive.significantDigits", /1 or 2/);
    has(studyIssues(study({ calibration: { after: "wafer" } })), "calibration.after", /"none", "package" or "board"/);
    has(studyIssues(study({ inclinationDeg: 90 })), "inclinationDeg", /horizontal field vanishes/);
    expect(validateStudy(study({ site: { lat: 48, lon: 11 }, sampling: "lhs", adaptive: {} }), ref).ok).toBe(true);
  });
});

describe("result file", () => {
  it("a finished study parses with the result schema and holds every metric id of the stack", () => {
    const st = compassStack({ axisTol: { dist: "normal", tol: 0.5 } }, { bondLine: { heightTol: { dist: "uniform", tol: 3 } } });
    const r = runStudy(st, studyOf(study({ trials: 3000, requirements: [{ metric: "heading.maxAbsDeg", max: 1, yield: 0.99 }] }), st));
    expect(ResultFileSchema.safeParse(r).success).toBe(true);
    expect(r.format).toBe("orthostack.result/1");
    expect(Object.keys(r.metrics)).toContain("heading.rmsDeg");
    expect(r.requirements[0].ci[0]).toBeLessThanOrEqual(r.requirements[0].predictedYield);
  });
});
