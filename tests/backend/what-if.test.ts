/**
 * Sweeps and allocations through the API, on the warm engine pool: the sweep's point at
 * today's tolerance is the ordinary study with the same seed, the curves fall as a tolerance
 * grows, an allocation's proposal holds as an ordinary study with another seed, and applying
 * it makes the draft. The stack is a variant of the reference stack (tolerances changed), so
 * nothing here leans on the reference's known results.
 */
import { readFileSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { withTolerances } from "@shared/whatif/parameters";
import { findSource } from "@shared/datasets/sources";
import type { StackFile } from "@shared/schemas/stack-file";
import { MAX_SWEEP_VALUES } from "@shared/schemas/what-if";
import { startTestApp, type TestApp } from "./harness";

const fixture = (name: string) => JSON.parse(readFileSync(new URL(`../fixtures/${name}`, import.meta.url), "utf8"));
const STACK = withTolerances(fixture("stack-reference.json") as StackFile, { "mag.axis": 0.7, "mag.yaw": 0.5, "pkg.bondLine": 12 });
const STUDY = { ...fixture("study-reference.json"), trials: 12_000, seed: 23, inclinationDeg: 55 };

let t: TestApp;
let eng: string;
let reviewer: string;
let revisionId: string;

beforeAll(async () => {
  t = await startTestApp();
  eng = await t.signIn("engineer@example.com");
  reviewer = await t.signIn("reviewer@example.com");
  const p = await t.call("POST", "/api/projects", { cookie: eng, body: { name: "what-if" } });
  const rev = await t.call("POST", `/api/projects/${p.body.id}/revisions`, { cookie: eng, body: { stack: STACK } });
  expect(rev.status).toBe(201);
  revisionId = rev.body.id;
});
afterAll(() => t?.close());

async function until(path: string, seconds = 240) {
  const end = Date.now() + seconds * 1000;
  const seen: number[] = [];
  for (;;) {
    const r = await t.call("GET", path, { cookie: eng });
    expect(r.status, JSON.stringify(r.body)).toBe(200);
    if (r.body.status === "running") seen.push(r.body.progress.done);
    if (!["queued", "running"].includes(r.body.status)) return { body: r.body, seen };
    if (Date.now() > end) throw new Error(`${path} did not finish`);
    await new Promise((res) => setTimeout(res, 150));
  }
}

const fieldsOf = (body: { error: { fields?: { path: string }[] } }) => body.error.fields?.map((f) => f.path) ?? [];

describe("what-if validation", () => {
  it("names the field at fault", async () => {
    const post = (path: string, body: unknown) => t.call("POST", `/api/revisions/${revisionId}/${path}`, { cookie: eng, body });
    const many = Array.from({ length: MAX_SWEEP_VALUES + 1 }, (_, i) => 0.1 * (i + 1));
    let r = await post("sweeps", { study: STUDY, parameter: "mag.axis", values: many });
    expect(r.status).toBe(400);
    expect(fieldsOf(r.body)).toContain("values");
    r = await post("sweeps", { study: STUDY, parameter: "mag.nothing", values: [0.1, 0.2] });
    expect(r.status).toBe(400);
    expect(fieldsOf(r.body)).toEqual(["parameter"]);
    r = await post("sweeps", { study: STUDY, parameter: "mag.axis", values: [0.2, -0.1] });
    expect(fieldsOf(r.body)).toEqual(["values.1"]);
    r = await post("sweeps", { study: { ...STUDY, trials: -5 }, parameter: "mag.axis", values: [0.2, 0.3] });
    expect(r.status).toBe(400);
    expect(fieldsOf(r.body).some((f) => f.startsWith("study."))).toBe(true);
    r = await post("allocations", { study: STUDY, free: ["mag.axis", "mag.elsewhere"] });
    expect(fieldsOf(r.body)).toEqual(["free.1"]);
    r = await post("allocations", { study: STUDY, costs: { "mag.axis": { a: 0, b: -1, k: 1 } } });
    expect(fieldsOf(r.body)).toEqual(["costs.mag.axis.b"]);
    r = await post("allocations", { study: STUDY, bounds: { "mag.axis": { min: 0.5, max: 0.2 } } });
    expect(r.status).toBe(400);
    expect(fieldsOf(r.body)[0]).toMatch(/^bounds\.mag\.axis/);
    // a reviewer reads but does not run
    r = await t.call("POST", `/api/revisions/${revisionId}/sweeps`, {
      cookie: reviewer,
      body: { study: STUDY, parameter: "mag.axis", values: [0.3, 0.6] },
    });
    expect(r.status).toBe(403);
  });
});

describe("sweeps", () => {
  it("the point at today's tolerance is the ordinary study with the same seed, and yields fall as the tolerance grows", async () => {
    const values = [1.4, 0.35, 0.7, 1.05];
    const s = await t.call("POST", `/api/revisions/${revisionId}/sweeps`, {
      cookie: eng,
      body: { study: STUDY, parameter: "mag.axis", values },
    });
    expect(s.status, JSON.stringify(s.body)).toBe(202);
    const study = await t.call("POST", `/api/revisions/${revisionId}/studies`, { cookie: eng, body: { study: STUDY } });
    expect(study.status).toBe(202);

    const { body: sweep, seen } = await until(`/api/sweeps/${s.body.id}`);
    expect(sweep.status).toBe("finished");
    expect(sweep.values).toEqual([0.35, 0.7, 1.05, 1.4]);
    expect(sweep.current).toBe(0.7);
    expect(sweep.progress).toEqual({ done: 4 * STUDY.trials, total: 4 * STUDY.trials });
    for (let i = 1; i < seen.length; i++) expect(seen[i]).toBeGreaterThanOrEqual(seen[i - 1]);

    const ordinary = (await until(`/api/studies/${study.body.id}`)).body;
    expect(ordinary.status).toBe("finished");
    const today = sweep.points.find((p: { value: number }) => p.value === 0.7);
    expect(today.requirements.map((r: { metric: string }) => r.metric)).toEqual(ordinary.result.requirements.map((r: any) => r.metric));
    today.requirements.forEach((r: any, i: number) => {
      const o = ordinary.result.requirements[i];
      expect(r.predictedYield).toBe(o.predictedYield);
      expect(r.ci).toEqual(o.ci);
      expect(r.passes).toBe(o.passes);
    });

    // common random numbers: no requirement's yield rises as the axis tolerance grows, and the
    // ones the magnetometer axis feeds (heading, magnetometer cross-axis) fall
    const ys = (k: number) => sweep.points.map((p: any) => p.requirements[k].predictedYield as number);
    for (let k = 0; k < STUDY.requirements.length; k++) {
      const y = ys(k);
      for (let i = 1; i < y.length; i++) expect(y[i]).toBeLessThanOrEqual(y[i - 1]);
    }
    for (const k of [0, 1]) expect(ys(k)[3]).toBeLessThan(ys(k)[0]);

    // a crossing lies between the two points whose yields straddle the target
    for (const [k, c] of sweep.crossings.entries()) {
      const target = STUDY.requirements[k].yield;
      const y = ys(k);
      const i = y.findIndex((v: number, j: number) => j + 1 < y.length && (v - target) * (y[j + 1] - target) < 0);
      if (i < 0) expect(c.value === null || y.includes(target)).toBe(true);
      else {
        expect(c.value).toBeGreaterThan(sweep.values[i]);
        expect(c.value).toBeLessThan(sweep.values[i + 1]);
      }
    }
  }, 300_000);
});

describe("allocations", () => {
  it("verifies a proposal that holds as an ordinary study with another seed; apply makes the draft once", async () => {
    const a = await t.call("POST", `/api/revisions/${revisionId}/allocations`, { cookie: eng, body: { study: STUDY } });
    expect(a.status, JSON.stringify(a.body)).toBe(202);
    const { body: alloc } = await until(`/api/allocations/${a.body.id}`, 400);
    expect(alloc.status, alloc.error).toBe("finished");
    expect(alloc.verified, JSON.stringify({ m: alloc.message, r: alloc.rounds, q: alloc.requirements })).toBe(true);
    for (const r of alloc.requirements) expect(r.ci[0]).toBeGreaterThanOrEqual(r.yield);
    const changed = alloc.sources.filter((s: any) => s.proposed !== s.current);
    expect(changed.length).toBeGreaterThan(0);
    for (const s of alloc.sources) {
      expect(s.costCurrent).toBeCloseTo(s.cost.a + s.cost.b / s.current ** s.cost.k, 9);
      expect(s.costProposed).toBeCloseTo(s.cost.a + s.cost.b / s.proposed ** s.cost.k, 9);
    }

    // a reviewer may not apply
    expect((await t.call("POST", `/api/allocations/${a.body.id}/apply`, { cookie: reviewer })).status).toBe(403);
    const applied = await t.call("POST", `/api/allocations/${a.body.id}/apply`, { cookie: eng });
    expect(applied.status, JSON.stringify(applied.body)).toBe(201);
    expect(applied.body.status).toBe("draft");
    expect(applied.body.basedOnId).toBe(revisionId);
    expect(applied.body.note).toMatch(/allocation/);
    for (const s of alloc.sources) expect(findSource(applied.body.stack, s.source)?.tolerance.tol).toBe(s.proposed);
    expect((await t.call("GET", `/api/allocations/${a.body.id}`, { cookie: eng })).body.appliedRevisionId).toBe(applied.body.id);
    expect((await t.call("POST", `/api/allocations/${a.body.id}/apply`, { cookie: eng })).status).toBe(409);

    // the draft as an ordinary study with another seed and more trials meets every target
    const check = await t.call("POST", `/api/revisions/${applied.body.id}/studies`, {
      cookie: eng,
      body: { study: { ...STUDY, seed: 90210, trials: 30_000 } },
    });
    const done = (await until(`/api/studies/${check.body.id}`)).body;
    expect(done.status).toBe("finished");
    for (const r of done.result.requirements) expect(r.predictedYield).toBeGreaterThanOrEqual(r.yield);
  }, 600_000);
});

describe("inclination grid", () => {
  it("gives the WMM inclination over the globe: steep near the poles, near zero at the magnetic equator", async () => {
    const r = await t.call("GET", "/api/inclination-grid?date=2026-06-01&stepDeg=10", { cookie: eng });
    expect(r.status).toBe(200);
    expect(r.body.latitudes).toHaveLength(18);
    expect(r.body.longitudes).toHaveLength(36);
    const row = (lat: number) => r.body.inclinationDeg[r.body.latitudes.findIndex((l: number) => l === lat)] as number[];
    // from memory of the WMM2025 inclination chart (NOAA/BGS): above +70° across high northern latitudes, below −60° in the far south
    expect(Math.min(...row(75))).toBeGreaterThan(70);
    expect(Math.max(...row(-75))).toBeLessThan(-60);
    expect(Math.min(...row(5).map(Math.abs))).toBeLessThan(15);
    const bad = await t.call("GET", "/api/inclination-grid?date=2031-01-01", { cookie: eng });
    expect(fieldsOf(bad.body)).toEqual(["date"]);
  });
});
