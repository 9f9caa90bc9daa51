/**
 * An as-built study end to end, with the real engine runner: upload first-build
 * measurements, map them, run the design and the as-built study on the same revision and
 * seed, and find the measured values in the as-built study's frozen stack and results.
 */
import { readFileSync } from "node:fs";
import { afterAll, beforeAll, expect, it } from "vitest";
import { startTestApp, type TestApp } from "./harness";

const fixture = (name: string) => JSON.parse(readFileSync(new URL(`../fixtures/${name}`, import.meta.url), "utf8"));
const stack = fixture("stack-reference.json");
const study = { ...fixture("study-reference.json"), trials: 4000, seed: 19 };

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp();
});
afterAll(() => t?.close());

async function untilFinished(cookie: string, id: string) {
  const end = Date.now() + 90_000;
  for (;;) {
    const r = await t.call("GET", `/api/studies/${id}`, { cookie });
    if (!["queued", "running"].includes(r.body.status)) return r;
    if (Date.now() > end) throw new Error("study did not finish");
    await new Promise((res) => setTimeout(res, 100));
  }
}

// 60 invented units: the magnetometer placed 3 mrad (0.17°) off on average, bond lines 0.8 µm thick.
const units = Array.from({ length: 60 }, (_, i) => ({
  id: `AB-${String(i + 1).padStart(2, "0")}`,
  yawMrad: 3 + ((i * 7) % 11) * 0.2 - 1,
  heightUm: 10.8 + ((i * 5) % 9) * 0.1 - 0.4,
}));
const CSV = [
  "unit,mag yaw [mrad],mag bond line [um]",
  ...units.map((u) => `${u.id},${u.yawMrad.toFixed(3)},${u.heightUm.toFixed(2)}`),
].join("\n");

it("runs as built beside the design: the replaced sources are frozen in the study and reach the engine", async () => {
  const eng = await t.signIn("engineer@example.com");
  const p = await t.call("POST", "/api/projects", { cookie: eng, body: { name: "as built end to end" } });
  const rev = await t.call("POST", `/api/projects/${p.body.id}/revisions`, { cookie: eng, body: { stack } });

  const form = new FormData();
  form.append("file", new Blob([CSV]), "first-build.csv");
  const up = await fetch(`${t.url}/api/projects/${p.body.id}/datasets`, {
    method: "POST",
    headers: { cookie: eng, origin: t.deps.baseURL },
    body: form,
  });
  expect(up.status).toBe(201);
  const ds = await up.json();

  const mapped = await t.call("PATCH", `/api/datasets/${ds.id}/mappings`, {
    cookie: eng,
    headers: { "if-match": up.headers.get("etag")! },
    body: {
      mappings: [
        { column: "mag yaw [mrad]", revisionId: rev.body.id, source: "mag.yaw" },
        { column: "mag bond line [um]", revisionId: rev.body.id, source: "mag.bondLine", nominal: 10 },
      ],
    },
  });
  expect(mapped.status, JSON.stringify(mapped.body)).toBe(200);

  const design = await t.call("POST", `/api/revisions/${rev.body.id}/studies`, { cookie: eng, body: { study, label: "Design" } });
  expect(design.status).toBe(202);
  const asBuilt = await t.call("POST", `/api/revisions/${rev.body.id}/studies`, {
    cookie: eng,
    body: {
      study,
      asBuilt: [
        { source: "mag.yaw", datasetId: ds.id, column: "mag yaw [mrad]", mode: "resample" },
        { source: "mag.bondLine", datasetId: ds.id, column: "mag bond line [um]", mode: "normal" },
      ],
    },
  });
  expect(asBuilt.status, JSON.stringify(asBuilt.body)).toBe(202);
  expect(asBuilt.body.label).toBe("As built: mag.yaw, mag.bondLine");
  expect(asBuilt.body.asBuilt.map((a: any) => [a.source, a.mode, a.n, a.datasetName, a.unit])).toEqual([
    ["mag.yaw", "resample", 60, "first-build.csv", "deg"],
    ["mag.bondLine", "normal", 60, "first-build.csv", "um"],
  ]);

  const [d, a] = [await untilFinished(eng, design.body.id), await untilFinished(eng, asBuilt.body.id)];
  expect(d.body.status).toBe("finished");
  expect(a.body.status).toBe("finished");
  expect(a.body.progress.done).toBe(4000);

  // the frozen stacks: design as in the revision, as built with the measured values in the tolerance's unit
  const mag = (s: any) => s.elements.find((e: any) => e.id === "mag");
  expect(mag(d.body.stack).placementTol.yawDeg).toEqual({ dist: "normal", tol: 0.4 });
  const yaw = mag(a.body.stack).placementTol.yawDeg;
  expect(yaw.dist).toBe("data");
  expect(yaw.values).toHaveLength(60);
  const yawDeg = units.map((u) => (Number(u.yawMrad.toFixed(3)) * 0.18) / Math.PI);
  yaw.values.forEach((v: number, i: number) => expect(v).toBeCloseTo(yawDeg[i], 12));
  const heights = units.map((u) => Number(u.heightUm.toFixed(2)) - 10);
  const hMean = heights.reduce((s, v) => s + v, 0) / 60;
  const hStd = Math.sqrt(heights.reduce((s, v) => s + (v - hMean) ** 2, 0) / 59);
  const bond = mag(a.body.stack).bondLine.heightTol;
  expect(bond.dist).toBe("normal");
  expect(bond.sigmas).toBe(3);
  expect(bond.mean).toBeCloseTo(hMean, 12);
  expect(bond.tol).toBeCloseTo(3 * hStd, 12);
  // the rest of the stack is the design's
  expect(a.body.stack.elements.filter((e: any) => e.id !== "mag")).toEqual(d.body.stack.elements.filter((e: any) => e.id !== "mag"));
  // and the revision itself is untouched
  const revNow = await t.call("GET", `/api/revisions/${rev.body.id}`, { cookie: eng });
  expect(mag(revNow.body.stack).placementTol.yawDeg).toEqual({ dist: "normal", tol: 0.4 });

  // the engine drew the measured values: its mag.yaw source has the data's mean and (population) spread
  const src = (r: any, id: string) => r.sources.find((s: any) => s.id === id);
  const yMean = yawDeg.reduce((s, v) => s + v, 0) / 60;
  const yPop = Math.sqrt(yawDeg.reduce((s, v) => s + (v - yMean) ** 2, 0) / 60);
  expect(src(a.body.result, "mag.yaw").mean).toBeCloseTo(yMean, 12);
  expect(src(a.body.result, "mag.yaw").sigma).toBeCloseTo(yPop, 12);
  expect(src(a.body.result, "mag.bondLine").mean).toBeCloseTo(hMean, 12);
  expect(src(d.body.result, "mag.yaw").mean).toBe(0);
  // a placement rotation of the magnetometer turns the heading one for one: 0.17° of systematic
  // yaw moves the mean of the worst heading error
  expect(a.body.result.metrics["heading.maxAbsDeg"].mean).not.toBeCloseTo(d.body.result.metrics["heading.maxAbsDeg"].mean, 3);

  // two studies of one project: what the compare page lists, one marked as built
  const list = await t.call("GET", `/api/projects/${p.body.id}/studies`, { cookie: eng });
  const byId = new Map(list.body.studies.map((s: any) => [s.id, s]));
  expect((byId.get(design.body.id) as any).asBuilt).toEqual([]);
  expect((byId.get(asBuilt.body.id) as any).asBuilt).toHaveLength(2);
  const act = await t.call("GET", `/api/projects/${p.body.id}/activity`, { cookie: eng });
  expect(act.body.activity.map((x: any) => x.summary)).toContain(
    "queued as-built study 2 on stack revision 1 (4,000 trials, seed 19), measured data for mag.yaw, mag.bondLine",
  );
});
