/**
 * Issue 13 through the API: a corner-height file with gaps, sent by a supplier for one lot,
 * maps in one step to the bond line (nominal from the stack), runs as built with whole rows,
 * and its capability reads with its confidence bound, lots and control chart.
 */
import { readFileSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq, sql } from "drizzle-orm";
import { activities, datasetMappings, datasets, reports, suppliers } from "@backend/db/schema";
import { startTestApp, type TestApp } from "./harness";
import { emptyReportContent } from "./report-fixtures";

const REFERENCE = JSON.parse(readFileSync(new URL("../fixtures/stack-reference.json", import.meta.url), "utf8"));
const study = { ...JSON.parse(readFileSync(new URL("../fixtures/study-reference.json", import.meta.url), "utf8")), trials: 2000, seed: 5 };

let t: TestApp;
let eng: string;
let sup: string;
let projectId: string;
let revisionId: string;

async function upload(path: string, cookie: string, name: string, content: string, fields: Record<string, string> = {}) {
  const form = new FormData();
  form.append("file", new Blob([content]), name);
  for (const [k, v] of Object.entries(fields)) form.append(k, v);
  const res = await fetch(t.url + path, { method: "POST", headers: { origin: t.deps.baseURL, cookie }, body: form });
  return { status: res.status, body: await res.json() };
}

// The magnetometer (0.9 × 0.5 mm, bond line 10 µm): corners at (±0.45, ±0.25) mm in MODEL.md's
// order. Unit i: heights 10 + 0.3·(i mod 3) + b·x + c·y µm with b = 2 + (i mod 5)·0.5 µm/mm, c = −1 µm/mm.
const X = [-0.45, 0.45, 0.45, -0.45],
  Y = [-0.25, -0.25, 0.25, 0.25];
const unitsOf = (n: number) =>
  Array.from({ length: n }, (_, i) => {
    const b = 2 + (i % 5) * 0.5,
      c = -1,
      a = 10 + 0.3 * (i % 3);
    return { id: `M${String(i + 1).padStart(3, "0")}`, lot: i < n / 2 ? "L2611" : "L2612", h: X.map((x, k) => a + b * x + c * Y[k]) };
  });
const UNITS = unitsOf(40);
// gaps as metrology exports write them: NA, empty, n/a, -, null, N/A
const GAPS: Record<number, [number, string]> = { 4: [1, "NA"], 11: [3, ""], 29: [0, "n/a"], 33: [2, "-"], 35: [2, "null"], 37: [0, "N/A"] };
const CSV = [
  "unit,lot,h0 [um],h1 [um],h2 [um],h3 [um]",
  ...UNITS.map((u, i) => [u.id, u.lot, ...u.h.map((v, k) => (GAPS[i]?.[0] === k ? GAPS[i][1] : v.toFixed(3)))].join(",")),
].join("\n");

beforeAll(async () => {
  t = await startTestApp();
  eng = await t.signIn("engineer@example.com");
  sup = await t.signIn("supplier@example.com");
  const p = await t.call("POST", "/api/projects", { cookie: eng, body: { name: "corner heights" } });
  projectId = p.body.id;
  const r = await t.call("POST", `/api/projects/${projectId}/revisions`, { cookie: eng, body: { stack: REFERENCE } });
  revisionId = r.body.id;
});
afterAll(() => t?.close());

async function releasedReport() {
  const [s] = await t.handle.db.select().from(suppliers).where(eq(suppliers.name, "Larkfield Assembly"));
  const [{ next }] = await t.handle.db.select({ next: sql<number>`coalesce(max(${reports.number}), 0)::int + 1` }).from(reports);
  const [r] = await t.handle.db
    .insert(reports)
    .values({
      workspaceId: s.workspaceId,
      projectId,
      supplierId: s.id,
      revisionId,
      number: next,
      revision: 1,
      status: "released",
      capability: { cpk: 1.33, overrides: {} },
      content: emptyReportContent({ projectId, revisionId, supplier: s }),
      releasedAt: new Date(),
    })
    .returning();
  return r.id;
}

const count = async () => (await t.handle.db.select({ n: sql<number>`count(*)::int` }).from(datasets))[0].n;

describe("a corner-height file from the line", () => {
  let datasetId: string;
  let reportId: string;

  it("the supplier sends it for one lot with a note; gaps are counted, not refused", async () => {
    reportId = await releasedReport();
    const res = await upload(`/api/reports/${reportId}/datasets`, sup, "mag-corners.csv", CSV, {
      lot: "L2611-12",
      note: "first build, corner heights by white-light interferometer",
    });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    datasetId = res.body.id;
    expect(res.body.lot).toBe("L2611-12");
    expect(res.body.note).toBe("first build, corner heights by white-light interferometer");
    const h = (k: number) => res.body.columns.find((c: any) => c.key === `h${k} [um]`).summary;
    expect([0, 1, 2, 3].map((k) => [h(k).n, h(k).missing])).toEqual([
      [38, 2],
      [39, 1],
      [38, 2],
      [39, 1],
    ]);
    // the engineer sees it by report and by lot
    const list = await t.call("GET", `/api/projects/${projectId}/datasets`, { cookie: eng });
    const mine = list.body.datasets.find((d: any) => d.id === datasetId);
    expect([mine.lot, mine.report.id, mine.supplierName]).toEqual(["L2611-12", reportId, "Larkfield Assembly"]);
    const [act] = await t.handle.db
      .select()
      .from(activities)
      .where(eq(activities.action, "dataset.uploaded"))
      .orderBy(sql`${activities.createdAt} desc`)
      .limit(1);
    expect(act.summary).toContain("lot L2611-12");
  });

  it("other text in a measured column is still refused with its row and column, nothing stored", async () => {
    const before = await count();
    const bad = CSV.replace(/\nM003,L2611,[^,]+,/, (m) => m.replace(/,[^,]+,$/, ",abc,"));
    const res = await upload(`/api/projects/${projectId}/datasets`, eng, "bad.csv", bad);
    expect(res.status).toBe(400);
    expect(res.body.error.message).toContain("Row 4, column C (h0 [um])");
    expect(res.body.error.message).toContain("“abc” is not a number");
    expect(await count()).toBe(before);
    const tooLong = await upload(`/api/projects/${projectId}/datasets`, eng, "ok.csv", CSV, { lot: "x".repeat(101) });
    expect(tooLong.status).toBe(400);
    expect(tooLong.body.error.fields[0].path).toBe("lot");
    expect(await count()).toBe(before);
  });

  it("four columns map in one step to the bond line's supports, the nominal taken from the stack", async () => {
    const res = await t.call("PATCH", `/api/datasets/${datasetId}/mappings`, {
      cookie: eng,
      headers: await t.ifMatch(`/api/datasets/${datasetId}`, eng),
      body: { mappings: [0, 1, 2, 3].map((k) => ({ column: `h${k} [um]`, revisionId, source: "mag.bondLine", support: k })) },
    });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const m = res.body.columns.find((c: any) => c.key === "h2 [um]").mapping;
    expect([m.source, m.part, m.partLabel, m.nominal]).toEqual(["mag.bondLine", 2, "support 2 (+x/2, +y/2)", 10]);
    // 40 rows, 6 with a gap in one corner
    expect(res.body.pooled).toEqual([
      {
        source: "mag.bondLine",
        revisionNumber: 1,
        columns: ["h0 [um]", "h1 [um]", "h2 [um]", "h3 [um]"],
        missingParts: [],
        parts: 4,
        completeRows: 34,
        dropped: 6,
      },
    ]);
  });

  it("refuses a second column for one support, a mix of pooled and single, a support the die lacks; nothing changed", async () => {
    const before = await t.handle.db.select().from(datasetMappings).where(eq(datasetMappings.datasetId, datasetId));
    const twice = await t.call("PATCH", `/api/datasets/${datasetId}/mappings`, {
      cookie: eng,
      headers: await t.ifMatch(`/api/datasets/${datasetId}`, eng),
      body: { mappings: [{ column: "h3 [um]", revisionId, source: "mag.bondLine", support: 0 }] },
    });
    expect(twice.status).toBe(400);
    expect(twice.body.error.fields[0]).toEqual({
      path: "mappings[0].support",
      message: "“h0 [um]” already measures this part of mag.bondLine",
    });
    const mixed = await t.call("PATCH", `/api/datasets/${datasetId}/mappings`, {
      cookie: eng,
      headers: await t.ifMatch(`/api/datasets/${datasetId}`, eng),
      body: { mappings: [{ column: "h3 [um]", revisionId, source: "mag.bondLine" }] },
    });
    expect(mixed.status).toBe(400);
    const far = await t.call("PATCH", `/api/datasets/${datasetId}/mappings`, {
      cookie: eng,
      headers: await t.ifMatch(`/api/datasets/${datasetId}`, eng),
      body: { mappings: [{ column: "h3 [um]", revisionId, source: "mag.bondLine", support: 4 }] },
    });
    expect(far.body.error.fields[0].message).toBe("mag.bondLine rests on 4 support points, numbered 0 to 3");
    const tilt = await t.call("PATCH", `/api/datasets/${datasetId}/mappings`, {
      cookie: eng,
      headers: await t.ifMatch(`/api/datasets/${datasetId}`, eng),
      body: { mappings: [{ column: "h3 [um]", revisionId, source: "mag.yaw", component: "x" }] },
    });
    expect(tilt.body.error.fields[0].message).toBe("mag.yaw is one quantity: leave out component");
    expect(await t.handle.db.select().from(datasetMappings).where(eq(datasetMappings.datasetId, datasetId))).toEqual(before);
  });

  it("statistics of a corner: gaps counted, real conversion wording, lots, Cpk with its lower bound, control chart", async () => {
    const lots = await t.call("PATCH", `/api/datasets/${datasetId}`, {
      cookie: eng,
      headers: await t.ifMatch(`/api/datasets/${datasetId}`, eng),
      body: { lotColumn: "lot" },
    });
    expect(lots.status).toBe(200);
    expect(lots.body.lotColumn).toBe("lot");
    const notLabel = await t.call("PATCH", `/api/datasets/${datasetId}`, {
      cookie: eng,
      headers: await t.ifMatch(`/api/datasets/${datasetId}`, eng),
      body: { lotColumn: "h0 [um]" },
    });
    expect(notLabel.status).toBe(400);
    const s = (await t.call("GET", `/api/datasets/${datasetId}/statistics?column=${encodeURIComponent("h0 [um]")}`, { cookie: eng })).body;
    expect([s.summary.n, s.summary.missing]).toEqual([38, 2]);
    expect(s.converted.text).toBe("the nominal 10 µm taken off each value.");
    expect(s.partLabel).toBe("support 0 (−x/2, −y/2)");
    expect(s.lots.map((l: any) => [l.lot, l.n])).toEqual([
      ["L2611", 20],
      ["L2612", 18],
    ]);
    const c = s.capability;
    expect(c.n).toBe(38);
    expect(c.basis).toBe("within lots");
    expect(c.cpkLower).toBeLessThan(c.cpk);
    // Bissell with ν = Σ(nᵢ − 1) = 36
    expect(c.cpkLower).toBeCloseTo(c.cpk - 1.6448536 * Math.sqrt(1 / (9 * 38) + (c.cpk * c.cpk) / (2 * 36)), 6);
    expect(s.controlChart.points).toHaveLength(38);
    expect(s.controlChart.points[0]).toMatchObject({ order: 1, row: 2, lot: "L2611", mr: null });
    expect(s.controlChart.constants.d2).toBe(1.128);
    // the mm → µm wording when a unit really changes
    const mm = await upload(`/api/projects/${projectId}/datasets`, eng, "mm.csv", "unit,height [mm]\nA,0.0112\nB,0.0104\nC,0.0098\n");
    await t.call("PATCH", `/api/datasets/${mm.body.id}/mappings`, {
      cookie: eng,
      headers: await t.ifMatch(`/api/datasets/${mm.body.id}`, eng),
      body: { mappings: [{ column: "height [mm]", revisionId, source: "mag.bondLine" }] },
    });
    const sm = (await t.call("GET", `/api/datasets/${mm.body.id}/statistics?column=${encodeURIComponent("height [mm]")}`, { cookie: eng }))
      .body;
    expect(sm.converted.text).toBe("the nominal 0.01 mm taken off each value; mm converted to µm (× 1000).");
    expect(sm.summary.mean).toBeCloseTo((11.2 + 10.4 + 9.8) / 3 - 10, 9);
  });

  it("runs as built from the corner heights: whole rows, complete rows only, the tilt those heights make", async () => {
    const normal = await t.call("POST", `/api/revisions/${revisionId}/studies`, {
      cookie: eng,
      body: { study, asBuilt: [{ source: "mag.bondLine", datasetId, mode: "normal" }] },
    });
    expect(normal.status).toBe(400);
    expect(normal.body.error.fields[0].path).toBe("asBuilt[0].mode");
    const res = await t.call("POST", `/api/revisions/${revisionId}/studies`, {
      cookie: eng,
      body: { study, asBuilt: [{ source: "mag.bondLine", datasetId, mode: "resample" }] },
    });
    expect(res.status, JSON.stringify(res.body)).toBe(202);
    const rec = res.body.asBuilt[0];
    expect([rec.source, rec.n, rec.dropped, rec.columns]).toEqual(["mag.bondLine", 34, 6, ["h0 [um]", "h1 [um]", "h2 [um]", "h3 [um]"]]);
    expect(rec.column).toBeUndefined();
    const end = Date.now() + 120_000;
    let s: any;
    do {
      await new Promise((r) => setTimeout(r, 150));
      s = (await t.call("GET", `/api/studies/${res.body.id}`, { cookie: eng })).body;
    } while (["queued", "running"].includes(s.status) && Date.now() < end);
    expect(s.status).toBe("finished");
    const rows = s.stack.elements.find((e: any) => e.id === "mag").bondLine.heightTol.rows;
    const complete = UNITS.filter((_, i) => !GAPS[i]);
    expect(rows).toHaveLength(34);
    rows.forEach((r: number[], i: number) => r.forEach((v, k) => expect(v).toBeCloseTo(Number(complete[i].h[k].toFixed(3)) - 10, 9)));
    // the plane through unit i's corners has slopes b and c: the tilt it makes, atan(√(b² + c²)), per unit
    const tilts = complete.map((_, i) => {
      const j = UNITS.indexOf(complete[i]);
      return (Math.atan(Math.hypot((2 + (j % 5) * 0.5) * 1e-3, 1e-3)) * 180) / Math.PI;
    });
    const src = s.result.sources.find((x: any) => x.id === "mag.bondLine");
    expect(src.draws).toBe(4);
    // the bond line alone would tilt the die by 0.128°–0.236°; every other tolerance adds to it
    expect(Math.min(...tilts)).toBeGreaterThan(0.12);
    expect(s.result.metrics["mag.tiltDeg"].p50).toBeGreaterThan(0.1);
    // a pooled source with a corner unmapped is refused by name
    await t.call("PATCH", `/api/datasets/${datasetId}/mappings`, {
      cookie: eng,
      headers: await t.ifMatch(`/api/datasets/${datasetId}`, eng),
      body: { mappings: [{ column: "h3 [um]", revisionId, source: null }] },
    });
    const partial = await t.call("POST", `/api/revisions/${revisionId}/studies`, {
      cookie: eng,
      body: { study, asBuilt: [{ source: "mag.bondLine", datasetId, mode: "resample" }] },
    });
    expect(partial.status).toBe(400);
    expect(partial.body.error.fields[0].message).toContain("support 3 (−x/2, +y/2)");
  });
});
