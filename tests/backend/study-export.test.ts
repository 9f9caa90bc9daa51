/**
 * A study's results out as a spreadsheet and as CSV (issue 14, item 6): read back with
 * exceljs and a CSV parser (fast-csv) and compared with the result the API gives.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import ExcelJS from "exceljs";
import { parseString } from "fast-csv";
import { workspaces } from "@backend/db/schema";
import type { ResultFile } from "@shared/schemas/result-file";
import { metricLabel } from "@shared/metrics";
import { startTestApp, type TestApp } from "./harness";
import { insertFinishedStudy } from "./report-fixtures";

let t: TestApp;
let engineer: string;
let studyId: string;
let result: ResultFile;

beforeAll(async () => {
  t = await startTestApp();
  engineer = await t.signIn("engineer@example.com");
  const [w] = await t.handle.db.select().from(workspaces);
  studyId = (await insertFinishedStudy(t.handle.db, { workspaceId: w.id })).studyId;
  const s = await t.call("GET", `/api/studies/${studyId}`, { cookie: engineer });
  result = s.body.result;
  // the fixture runs a 2,000-trial study on the engine: time for a loaded machine
}, 180_000);
afterAll(() => t?.close());

async function download(format: string) {
  const res = await fetch(`${t.url}/api/studies/${studyId}/export?format=${format}`, { headers: { cookie: engineer } });
  return { res, bytes: Buffer.from(await res.arrayBuffer()) };
}

const r6 = (v: number) => Number(v.toPrecision(6));
const rowsOf = (ws: ExcelJS.Worksheet) => {
  const out: unknown[][] = [];
  ws.eachRow((row) => out.push((row.values as unknown[]).slice(1)));
  return out;
};

describe("study export", () => {
  it("xlsx: metrics with every statistic and its unit, requirements in %, contributors, the heading envelope", async () => {
    const { res, bytes } = await download("xlsx");
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toContain("spreadsheetml");
    expect(res.headers.get("content-disposition")).toMatch(/attachment; filename="study-\d+-results\.xlsx"/);
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(bytes as unknown as ArrayBuffer);
    expect(wb.worksheets.map((w) => w.name)).toEqual(["Study", "Metrics", "Requirements", "Contributors", "Heading envelope"]);

    const [head, ...metrics] = rowsOf(wb.getWorksheet("Metrics")!);
    expect(head.slice(0, 10)).toEqual([
      "Metric",
      "Metric id",
      "Unit",
      "Mean",
      "Std deviation",
      "P50 of absolute value",
      "P95 of absolute value",
      "P99 of absolute value",
      "P99.73 of absolute value",
      "Max of absolute value",
    ]);
    expect(metrics.map((r) => r[1])).toEqual(Object.keys(result.metrics));
    for (const row of metrics) {
      const m = result.metrics[row[1] as string];
      expect(row[0]).toBe(metricLabel(row[1] as string));
      expect(row[2]).toBe(m.unit === "deg" ? "°" : "%");
      expect(row.slice(3, 10)).toEqual([m.mean, m.std, m.p50, m.p95, m.p99, m.p9973, m.max].map(r6));
      // numbers stay numbers
      expect(typeof row[5]).toBe("number");
    }
    expect(metrics.find((r) => r[1] === "heading.maxAbsDeg")?.[2]).toBe("°");

    const [, ...reqs] = rowsOf(wb.getWorksheet("Requirements")!);
    expect(reqs).toHaveLength(result.requirements.length);
    reqs.forEach((row, i) => {
      const q = result.requirements[i];
      expect(row[1]).toBe(q.metric);
      expect(row[3]).toBe(q.max);
      expect(row[4]).toBeCloseTo(q.yield * 100, 4);
      expect(row[5]).toBeCloseTo(q.predictedYield * 100, 4);
      expect(row[9]).toBe(q.passes ? "yes" : "no");
    });

    const [contribHead, ...contrib] = rowsOf(wb.getWorksheet("Contributors")!);
    expect(contribHead.slice(4, 8)).toEqual([
      "Monte Carlo share (%)",
      "Monte Carlo share 95 % low (%)",
      "Monte Carlo share 95 % high (%)",
      "Monte Carlo share told from zero",
    ]);
    // every source in the order of the result; each Monte Carlo share inside its interval, told
    // apart from zero only when the interval stays above it; no share for a source the metric
    // does not depend on
    const sources = result.contributors.flatMap((c) => c.sources);
    contrib.forEach((row, i) => {
      const src = sources[i];
      expect(row[2]).toBe(src.source);
      if (src.linearContribution === 0) {
        expect(row[7]).toBe("no sensitivity");
        expect(row[4] ?? null).toBeNull();
        return;
      }
      if (src.mcShare === null) return;
      const [share, lo, hi] = [row[4], row[5], row[6]] as number[];
      expect(lo).toBeLessThanOrEqual(share + 1e-4);
      expect(hi).toBeGreaterThanOrEqual(share - 1e-4);
      // a share not told apart from zero has an interval reaching zero
      expect(["yes", "no"]).toContain(row[7]);
      if (row[7] === "no") expect(lo).toBe(0);
    });
    expect(contrib.some((row) => row[7] === "yes")).toBe(true);
    expect(contrib).toHaveLength(result.contributors.reduce((n, c) => n + c.sources.length, 0));
    const first = result.contributors[0];
    expect(contrib[0].slice(1, 4)).toEqual([
      first.metric,
      first.sources[0].source,
      Number((first.sources[0].linearShare * 100).toFixed(4)),
    ]);

    const [envHead, ...env] = rowsOf(wb.getWorksheet("Heading envelope")!);
    expect(envHead[0]).toBe("Pitch (°)");
    expect(result.envelope).not.toBeNull();
    expect(env).toHaveLength(result.envelope!.points.length);
    expect(env[0][5]).toBe(r6(result.envelope!.points[0].p95));
  });

  it("csv: the same tables under their titles, readable by a CSV parser", async () => {
    const { res, bytes } = await download("csv");
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toMatch(/^text\/csv/);
    const text = bytes.toString("utf8").replace(/^\uFEFF/, "");
    const rows: string[][] = await new Promise((resolve, reject) => {
      const out: string[][] = [];
      parseString(text, { ignoreEmpty: false, discardUnmappedColumns: false, strictColumnHandling: false })
        .on("data", (r: string[]) => out.push(r))
        .on("error", reject)
        .on("end", () => resolve(out));
    });
    const section = (title: string) => {
      const at = rows.findIndex((r) => r.length === 1 && r[0] === title);
      expect(at, title).toBeGreaterThan(0);
      const body: string[][] = [];
      for (let i = at + 2; i < rows.length && rows[i].some((c) => c !== ""); i++) body.push(rows[i]);
      return { header: rows[at + 1], body };
    };
    const metrics = section("Metrics");
    expect(metrics.header[3]).toBe("Mean");
    expect(metrics.body).toHaveLength(Object.keys(result.metrics).length);
    const heading = metrics.body.find((r) => r[1] === "heading.maxAbsDeg")!;
    expect(heading[2]).toBe("°");
    expect(Number(heading[8])).toBe(r6(result.metrics["heading.maxAbsDeg"].p9973));
    const reqs = section("Requirements");
    expect(reqs.body.map((r) => r[1])).toEqual(result.requirements.map((q) => q.metric));
    expect(Number(reqs.body[0][4])).toBeCloseTo(result.requirements[0].yield * 100, 4);
    expect(section("Contributors").body.length).toBeGreaterThan(0);
    expect(section("Heading envelope").body).toHaveLength(result.envelope!.points.length);
  });

  it("refuses an unknown format naming the field, and a study without a result", async () => {
    const bad = await t.call("GET", `/api/studies/${studyId}/export?format=pdf`, { cookie: engineer });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.map((f: { path: string }) => f.path)).toContain("format");
    const [w] = await t.handle.db.select().from(workspaces);
    const running = await insertFinishedStudy(t.handle.db, { workspaceId: w.id, studyStatus: "running" });
    const r = await t.call("GET", `/api/studies/${running.studyId}/export?format=csv`, { cookie: engineer });
    expect(r.status).toBe(409);
  });
});
