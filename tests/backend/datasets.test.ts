/**
 * Data sets through the API: upload of CSV and XLSX, every refusal with its row and column
 * (and nothing stored), mappings, statistics, suppliers sending through a released report,
 * and the checks of an as-built study request.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import ExcelJS from "exceljs";
import { and, eq, sql } from "drizzle-orm";
import { activities, datasets, projects, reports, stackRevisions, studies, suppliers } from "@backend/db/schema";
import { DATASET_MAX_BYTES, DATASET_MAX_ROWS } from "@shared/schemas/datasets";
import { DEMO_DATASET_NAME } from "@backend/demo/seed-datasets";
import { startTestApp, type TestApp } from "./harness";
import { readFileSync } from "node:fs";
import { emptyReportContent } from "./report-fixtures";

const REFERENCE = JSON.parse(readFileSync(new URL("../fixtures/stack-reference.json", import.meta.url), "utf8"));

let t: TestApp;
let eng: string;
let rev: string;
let sup: string;
let projectId: string;
let revisionId: string;

type Upload = { status: number; body: any };

async function upload(path: string, cookie: string | undefined, name: string, content: string | Buffer, field = "file"): Promise<Upload> {
  const form = new FormData();
  const bytes = typeof content === "string" ? Buffer.from(content, "utf8") : content;
  form.append(field, new Blob([new Uint8Array(bytes)]), name);
  const res = await fetch(t.url + path, { method: "POST", headers: { origin: t.deps.baseURL, ...(cookie ? { cookie } : {}) }, body: form });
  const text = await res.text();
  return { status: res.status, body: text ? JSON.parse(text) : null };
}

const uploadToProject = (name: string, content: string | Buffer, cookie = eng) =>
  upload(`/api/projects/${projectId}/datasets`, cookie, name, content);

async function counts() {
  const [d] = await t.handle.db.select({ n: sql<number>`count(*)::int` }).from(datasets);
  const [a] = await t.handle.db
    .select({ n: sql<number>`count(*)::int` })
    .from(activities)
    .where(eq(activities.action, "dataset.uploaded"));
  return { datasets: d.n, activities: a.n };
}

async function xlsx(rows: unknown[][], sheetName = "Build 1"): Promise<Buffer> {
  const wb = new ExcelJS.Workbook();
  const ws = wb.addWorksheet(sheetName);
  for (const r of rows) ws.addRow(r);
  return Buffer.from(await wb.xlsx.writeBuffer());
}

const TILT_CSV = [
  "unit,tilt [deg],yaw [mrad],height [um]",
  ...Array.from({ length: 30 }, (_, i) => `U${i + 1},${((i % 7) - 3) * 0.02},${((i % 5) - 2) * 0.8},${10 + ((i % 3) - 1) * 0.5}`),
].join("\n");

beforeAll(async () => {
  t = await startTestApp();
  eng = await t.signIn("engineer@example.com");
  rev = await t.signIn("reviewer@example.com");
  sup = await t.signIn("supplier@example.com");
  const p = await t.call("POST", "/api/projects", { cookie: eng, body: { name: "data sets" } });
  projectId = p.body.id;
  const r = await t.call("POST", `/api/projects/${projectId}/revisions`, { cookie: eng, body: { stack: REFERENCE } });
  revisionId = r.body.id;
});
afterAll(() => t?.close());

describe("upload", () => {
  it("a CSV becomes a data set: columns with units, rows, a preview, who sent it and when", async () => {
    const before = await counts();
    const res = await uploadToProject("first-build tilt.csv", TILT_CSV);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const d = res.body;
    expect(d.id).toMatch(/^[0-9a-f-]{36}$/);
    expect(d.name).toBe("first-build tilt.csv");
    expect(d.fileType).toBe("csv");
    expect(d.rows).toBe(30);
    expect(d.columns.map((c: any) => [c.key, c.name, c.unit, c.kind, c.letter])).toEqual([
      ["unit", "unit", null, "label", "A"],
      ["tilt [deg]", "tilt", "deg", "number", "B"],
      ["yaw [mrad]", "yaw", "mrad", "number", "C"],
      ["height [um]", "height", "um", "number", "D"],
    ]);
    expect(d.columns[1].summary.n).toBe(30);
    expect(d.preview.rowNumbers.slice(0, 3)).toEqual([2, 3, 4]);
    expect(d.preview.cells[0]).toEqual(["U1", "-0.06", "-1.6", "9.5"]);
    expect(d.preview.cells).toHaveLength(20);
    expect(d.uploadedByName).toBe("Ezra Lindqvist");
    expect(d.uploadedByRole).toBe("engineer");
    expect(Date.now() - Date.parse(d.createdAt)).toBeLessThan(60_000);
    expect(d.sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(await counts()).toEqual({ datasets: before.datasets + 1, activities: before.activities + 1 });

    const list = await t.call("GET", `/api/projects/${projectId}/datasets`, { cookie: rev });
    expect(list.status).toBe(200);
    expect(list.body.datasets[0]).toMatchObject({ id: d.id, rows: 30, uploadedByName: "Ezra Lindqvist", columnCount: 4 });
    const one = await t.call("GET", `/api/datasets/${d.id}`, { cookie: rev });
    expect(one.body.columns).toHaveLength(4);
    const file = await fetch(`${t.url}/api/datasets/${d.id}/file`, { headers: { cookie: rev } });
    expect(await file.text()).toBe(TILT_CSV);
    const act = await t.call("GET", `/api/projects/${projectId}/activity`, { cookie: rev });
    expect(act.body.activity[0].summary).toBe("uploaded the data set “first-build tilt.csv” (30 rows, 3 measured columns)");
  });

  it("reads CSV as spreadsheets write it: BOM, CRLF, quotes with commas, line breaks and doubled quotes, trailing blank lines", async () => {
    const csv = '\uFEFF"unit id","tilt, x [deg]",note\r\n"A1",0.01,"said ""ok"""\r\n"A2", -0.02 ,"two\r\nlines"\r\n\r\nA3,+1e-2,\r\n\r\n';
    const res = await uploadToProject("quoted.csv", csv);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.columns.map((c: any) => c.key)).toEqual(["unit id", "tilt, x [deg]", "note"]);
    expect(res.body.rows).toBe(3);
    expect(res.body.preview.cells).toEqual([
      ["A1", "0.01", 'said "ok"'],
      ["A2", "-0.02", "two\r\nlines"],
      ["A3", "+1e-2", ""],
    ]);
    expect(res.body.preview.rowNumbers).toEqual([2, 3, 5]);
    expect(res.body.columns[1].summary).toMatchObject({ n: 3, min: -0.02, max: 0.01 });
  });

  it("semicolon files with decimal commas, and Windows-1252 text (µm)", async () => {
    const semi = "serial;bow [um];x [mm]\nS1;12,5;0,010\nS2;-3,25;-0,005\n";
    const a = await uploadToProject("semicolon.csv", semi);
    expect(a.status, JSON.stringify(a.body)).toBe(201);
    expect(a.body.columns[1].summary).toMatchObject({ min: -3.25, max: 12.5 });
    const latin = Buffer.concat([Buffer.from("lot,height ["), Buffer.from([0xb5]), Buffer.from("m]\nL1,3.5\nL2,4.5\n")]);
    const b = await uploadToProject("ansi.csv", latin);
    expect(b.status, JSON.stringify(b.body)).toBe(201);
    expect(b.body.columns[1]).toMatchObject({ key: "height [µm]", unit: "um" });
  });

  it("an XLSX workbook: first sheet with data, numbers, formulas and rich-text headers", async () => {
    const wb = new ExcelJS.Workbook();
    wb.addWorksheet("Empty cover");
    const ws = wb.addWorksheet("Die tilt");
    ws.addRow(["Unit", { richText: [{ text: "tilt_x " }, { text: "[deg]" }] }, "tilt_y [deg]"]);
    ws.addRow(["D1", 0.012, -0.004]);
    ws.addRow(["D2", { formula: "B2*2", result: 0.024 }, 0.006]);
    ws.addRow(["D3", "0.018", 0.001]);
    const res = await uploadToProject("tilt.xlsx", Buffer.from(await wb.xlsx.writeBuffer()));
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body).toMatchObject({ fileType: "xlsx", sheet: "Die tilt", rows: 3 });
    expect(res.body.columns.map((c: any) => [c.key, c.unit, c.kind])).toEqual([
      ["Unit", null, "label"],
      ["tilt_x [deg]", "deg", "number"],
      ["tilt_y [deg]", "deg", "number"],
    ]);
    expect(res.body.columns[1].summary).toMatchObject({ n: 3, min: 0.012, max: 0.024 });
  });
});

describe("refused files: 400 naming the row and column, nothing stored", () => {
  const cases: Array<{
    what: string;
    name: string;
    content: string | Buffer | (() => Promise<string | Buffer> | string | Buffer);
    status?: number;
    code: string;
    message: RegExp;
  }> = [
    {
      what: "a word in a number column",
      name: "a.csv",
      content: "unit,tilt [deg]\nU1,0.1\nU2,0.1o\n",
      code: "invalid_file",
      message: /^Row 3, column B \(tilt \[deg\]\): “0\.1o” is not a number/,
    },
    {
      what: "a measured column of gaps only",
      name: "b.csv",
      content: "unit,tilt [deg],yaw [deg]\nU1,NA,0.2\nU2,,0.3\n",
      code: "invalid_file",
      message: /^Row 1, column B \(tilt \[deg\]\): the column holds only gaps/,
    },
    {
      what: "an unknown unit in a header",
      name: "c.csv",
      content: "unit,tilt_x [furlong]\nU1,1\n",
      code: "invalid_file",
      message: /^Row 1, column B \(tilt_x \[furlong\]\): unknown unit “furlong”/,
    },
    {
      what: "empty brackets in a header",
      name: "c2.csv",
      content: "tilt_x []\n1\n",
      code: "invalid_file",
      message: /^Row 1, column A \(tilt_x \[\]\): the brackets in the header hold no unit/,
    },
    { what: "an empty file", name: "d.csv", content: "", code: "empty_file", message: /“d\.csv” is empty/ },
    { what: "only blank lines", name: "d2.csv", content: "\r\n , ,\r\n\r\n", code: "empty_file", message: /holds no data/ },
    {
      what: "a header without rows",
      name: "e.csv",
      content: "unit,tilt [deg]\n",
      code: "empty_file",
      message: /^Row 2: the file has a header but no data rows/,
    },
    {
      what: "a PDF",
      name: "report.pdf",
      content: Buffer.from("%PDF-1.7\n%\u00e2\u00e3\n1 0 obj\n<<>>\nendobj\n\u0000\u0000", "latin1"),
      code: "wrong_file_type",
      message: /“report\.pdf” is not a CSV file or an Excel workbook/,
    },
    {
      what: "a PNG named .csv",
      name: "photo.csv",
      content: Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13]),
      code: "wrong_file_type",
      message: /is not a CSV file or an Excel workbook/,
    },
    {
      what: "an old .xls",
      name: "old.xls",
      content: Buffer.from([0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1, 0, 0]),
      code: "wrong_file_type",
      message: /old-style Excel file \(\.xls\)/,
    },
    {
      what: "text named .xlsx",
      name: "fake.xlsx",
      content: "unit,tilt [deg]\nU1,1\n",
      code: "wrong_file_type",
      message: /named \.xlsx but is not an Excel workbook/,
    },
    {
      what: "a broken workbook",
      name: "broken.xlsx",
      content: Buffer.concat([Buffer.from([0x50, 0x4b, 0x03, 0x04]), Buffer.alloc(200, 7)]),
      code: "invalid_file",
      message: /could not be read as an Excel workbook/,
    },
    {
      what: "an unclosed quote",
      name: "f.csv",
      content: 'unit,tilt [deg]\nU1,0.1\n"U2,0.2\n',
      code: "invalid_file",
      message: /^Row 3, column A: a quoted field is not closed/,
    },
    {
      what: "text after a closing quote",
      name: "f2.csv",
      content: 'unit,tilt [deg]\n"U1"x,0.1\n',
      code: "invalid_file",
      message: /^Row 2, column A: text after the closing quote/,
    },
    {
      what: "values under no header",
      name: "g.csv",
      content: "unit,tilt [deg]\nU1,0.1,7\n",
      code: "invalid_file",
      message: /^Row 1, column C: the column has values but no header/,
    },
    {
      what: "a header used twice",
      name: "h.csv",
      content: "tilt [deg],tilt [deg]\n1,2\n",
      code: "invalid_file",
      message: /^Row 1, column B \(tilt \[deg\]\): the header “tilt \[deg\]” is already used by column A/,
    },
    {
      what: "no column of numbers",
      name: "i.csv",
      content: "unit,operator\nU1,Kim\n",
      code: "invalid_file",
      message: /^Row 1: no column holds numbers/,
    },
    {
      what: "a date in a number column (XLSX)",
      name: "j.xlsx",
      content: () =>
        xlsx([
          ["unit", "yaw [deg]"],
          ["U1", 0.1],
          ["U2", new Date(Date.UTC(2026, 2, 14))],
        ]),
      code: "invalid_file",
      message: /^Row 3, column B \(yaw \[deg\]\): holds a date \(2026-03-14\), not a number/,
    },
    {
      what: "a spreadsheet error (XLSX)",
      name: "k.xlsx",
      content: () =>
        xlsx([
          ["unit", "yaw [deg]"],
          ["U1", 0.1],
          ["U2", { error: "#DIV/0!" }],
        ]),
      code: "invalid_file",
      message: /^Row 3, column B \(yaw \[deg\]\): holds the spreadsheet error #DIV\/0!, not a number/,
    },
    {
      what: "a formula without a numeric result (XLSX)",
      name: "k2.xlsx",
      content: () =>
        xlsx([
          ["unit", "yaw [deg]"],
          ["U1", { formula: "1/0", result: { error: "#DIV/0!" } }],
        ]),
      code: "invalid_file",
      message: /^Row 2, column B \(yaw \[deg\]\): holds the formula =1\/0 with no number saved as its result/,
    },
    {
      what: "more rows than allowed (XLSX)",
      name: "big.xlsx",
      content: () => xlsx([["v [um]"], ...Array.from({ length: DATASET_MAX_ROWS + 1 }, (_, i) => [i])]),
      code: "too_many_rows",
      message: /more than 100,000 data rows/,
    },
    {
      what: "more rows than allowed",
      name: "big.csv",
      content: () => "v [um]\n" + "1\n".repeat(DATASET_MAX_ROWS + 1),
      code: "too_many_rows",
      message: /more than 100,000 data rows/,
    },
    {
      what: "a file over the size limit",
      name: "huge.csv",
      content: () => "v [um]\n" + "123456789\n".repeat(Math.ceil(DATASET_MAX_BYTES / 10) + 10),
      status: 413,
      code: "too_large",
      message: /larger than 5 MB/,
    },
  ];

  for (const c of cases) {
    it(c.what, async () => {
      const before = await counts();
      const res = await uploadToProject(c.name, typeof c.content === "function" ? await c.content() : c.content);
      expect(res.status, JSON.stringify(res.body)).toBe(c.status ?? 400);
      expect(res.body.error.code).toBe(c.code);
      expect(res.body.error.message).toMatch(c.message);
      if ((c.status ?? 400) === 400) expect(res.body.error.message).toMatch(/Nothing was stored|nothing was stored/);
      expect(await counts()).toEqual(before);
    });
  }

  it("gaps (empty, short rows, missing markers, empty XLSX cells) are counted, not refused", async () => {
    const csv = await uploadToProject(
      "gaps.csv",
      "unit,tilt [deg],yaw [deg]\nU1,0.1,0.2\nU2,,0.3\nU3,NA,-\nU4,n/a,null\nU5,N/A\nU6,0.4,0.5\n",
    );
    expect(csv.status, JSON.stringify(csv.body)).toBe(201);
    const sum = (d: any, k: string) => d.columns.find((c: any) => c.key === k).summary;
    expect([sum(csv.body, "tilt [deg]").n, sum(csv.body, "tilt [deg]").missing]).toEqual([2, 4]);
    expect([sum(csv.body, "yaw [deg]").n, sum(csv.body, "yaw [deg]").missing]).toEqual([3, 3]);
    expect(sum(csv.body, "tilt [deg]").mean).toBeCloseTo(0.25, 12);
    const book = await uploadToProject(
      "gaps.xlsx",
      await xlsx([
        ["unit", "yaw [deg]", "tilt [deg]"],
        ["U1", 0.1, 0.2],
        ["U2", null, 0.3],
        ["U3", "NA", 0.1],
      ]),
    );
    expect(book.status).toBe(201);
    expect([sum(book.body, "yaw [deg]").n, sum(book.body, "yaw [deg]").missing]).toEqual([1, 2]);
    // a first cell that is a gap does not turn a measured column into labels
    const first = await uploadToProject("first-gap.csv", "unit,z\nU1,NA\nU2,1.5\nU3,2\n");
    expect(first.body.columns[1]).toMatchObject({ kind: "number", summary: { n: 2, missing: 1 } });
  });

  it("lists every problem of a file in the fields, with row and column", async () => {
    const res = await uploadToProject("many.csv", "unit,tilt [deg],yaw [deg]\nU1,x,0.1\nU2,0.2,?\nU3,0.3,y\n");
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/^Row 2, column B \(tilt \[deg\]\): “x” is not a number\. \(3 problems; nothing was stored\)$/);
    expect(res.body.error.fields).toContainEqual({ path: "Row 4, column C (yaw [deg])", message: "“y” is not a number" });
    expect(res.body.error.fields).toContainEqual({ path: "Row 3, column C (yaw [deg])", message: "“?” is not a number" });
    expect(res.body.error.fields.map((f: any) => f.path).sort()).toEqual([
      "Row 2, column B (tilt [deg])",
      "Row 3, column C (yaw [deg])",
      "Row 4, column C (yaw [deg])",
    ]);
  });

  it("no file, or the file in another field", async () => {
    const before = await counts();
    // a JSON body is not a form at all: refused before it is read (request-guard)
    const none = await t.call("POST", `/api/projects/${projectId}/datasets`, { cookie: eng, body: {} });
    expect(none.status).toBe(415);
    expect(none.body.error.code).toBe("unsupported_media_type");
    const wrong = await upload(`/api/projects/${projectId}/datasets`, eng, "a.csv", "v [um]\n1\n", "upload");
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.code).toBe("missing_file");
    expect(await counts()).toEqual(before);
  });

  it("a reviewer may read but not upload; a project of another workspace is not found", async () => {
    const r = await uploadToProject("ok.csv", "v [um]\n1\n2\n", rev);
    expect(r.status).toBe(403);
    const missing = await upload(`/api/projects/00000000-0000-4000-8000-000000000000/datasets`, eng, "ok.csv", "v [um]\n1\n2\n");
    expect(missing.status).toBe(404);
  });
});

describe("mapping and statistics", () => {
  let id: string;
  beforeAll(async () => {
    const res = await uploadToProject("map-me.csv", TILT_CSV + "\nU31,0.9,0.1,10.0\n");
    id = res.body.id;
  });

  it("maps a column to a source of a revision, in its header's unit", async () => {
    const res = await t.call("PATCH", `/api/datasets/${id}/mappings`, {
      cookie: eng,
      headers: await t.ifMatch(`/api/datasets/${id}`, eng),
      body: {
        mappings: [
          { column: "yaw [mrad]", revisionId, source: "mag.yaw" },
          { column: "height [um]", revisionId, source: "mag.bondLine", nominal: 10 },
        ],
      },
    });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const yaw = res.body.columns.find((c: any) => c.key === "yaw [mrad]");
    expect(yaw.mapping).toMatchObject({
      revisionId,
      revisionNumber: 1,
      source: "mag.yaw",
      unit: "mrad",
      sourceUnit: "deg",
      nominal: 0,
      updatedByName: "Ezra Lindqvist",
    });
    expect(res.body.mappedColumns).toEqual(
      expect.arrayContaining([
        { column: "yaw [mrad]", source: "mag.yaw" },
        { column: "height [um]", source: "mag.bondLine" },
      ]),
    );
  });

  it("refuses what cannot be right, naming the field, and changes nothing", async () => {
    const other = await t.call("POST", "/api/projects", { cookie: eng, body: { name: "other" } });
    const otherRev = await t.call("POST", `/api/projects/${other.body.id}/revisions`, { cookie: eng, body: { stack: REFERENCE } });
    const res = await t.call("PATCH", `/api/datasets/${id}/mappings`, {
      cookie: eng,
      headers: await t.ifMatch(`/api/datasets/${id}`, eng),
      body: {
        mappings: [
          { column: "tilt [deg]", revisionId, source: "mag.nothing" },
          { column: "tilt [deg]", revisionId, source: "mag.yaw", unit: "mrad" },
          { column: "height [um]", revisionId, source: "mag.yaw" },
          { column: "unit", revisionId, source: "mag.yaw" },
          { column: "nope", revisionId, source: "mag.yaw" },
          { column: "tilt [deg]", revisionId: otherRev.body.id, source: "mag.yaw" },
        ],
      },
    });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe("invalid_mapping");
    expect(res.body.error.fields).toEqual([
      { path: "mappings[0].source", message: "stack revision 1 has no tolerance source “mag.nothing”" },
      { path: "mappings[1].unit", message: "the header of “tilt [deg]” says deg; leave out the unit or use deg" },
      { path: "mappings[2].unit", message: "mag.yaw is an angle in degrees; a column in µm cannot measure it" },
      { path: "mappings[3].column", message: "“unit” holds labels, not measurements" },
      { path: "mappings[4].column", message: "no column “nope” in this data set" },
      { path: "mappings[5].revisionId", message: "no stack revision with this id in the data set's project" },
    ]);
    const d = await t.call("GET", `/api/datasets/${id}`, { cookie: eng });
    expect(d.body.columns.find((c: any) => c.key === "tilt [deg]").mapping).toBeNull();
  });

  it("a column without a unit needs one when mapped", async () => {
    const up = await uploadToProject("no-unit.csv", "unit,tilt\nU1,0.1\nU2,0.2\n");
    expect(up.body.columns[1]).toMatchObject({ key: "tilt", unit: null, kind: "number" });
    const bad = await t.call("PATCH", `/api/datasets/${up.body.id}/mappings`, {
      cookie: eng,
      headers: await t.ifMatch(`/api/datasets/${up.body.id}`, eng),
      body: { mappings: [{ column: "tilt", revisionId, source: "mag.yaw" }] },
    });
    expect(bad.body.error.fields).toEqual([
      { path: "mappings[0].unit", message: "“tilt” has no unit in its header: give one of um, mm, deg, mrad, arcmin" },
    ]);
    const ok = await t.call("PATCH", `/api/datasets/${up.body.id}/mappings`, {
      cookie: eng,
      headers: await t.ifMatch(`/api/datasets/${up.body.id}`, eng),
      body: { mappings: [{ column: "tilt", revisionId, source: "mag.yaw", unit: "arcmin" }] },
    });
    expect(ok.status).toBe(200);
    expect(ok.body.columns[1].mapping.unit).toBe("arcmin");
  });

  it("statistics of a mapped column are in the source's unit, with capability against its tolerance", async () => {
    const stack = REFERENCE;
    const mag = stack.elements.find((e: any) => e.id === "mag");
    const T = mag.placementTol.yawDeg.tol as number;
    const res = await t.call("GET", `/api/datasets/${id}/statistics?column=${encodeURIComponent("yaw [mrad]")}`, { cookie: rev });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const s = res.body;
    expect(s.unit).toBe("deg");
    expect(s.source).toBe("mag.yaw");
    expect(s.converted).toMatchObject({ from: "mrad", nominal: 0 });
    expect(s.converted.factor).toBeCloseTo(0.18 / Math.PI, 12);
    const raw = [...Array.from({ length: 30 }, (_, i) => ((i % 5) - 2) * 0.8), 0.1];
    const deg = raw.map((v) => (v * 0.18) / Math.PI);
    const mean = deg.reduce((a, b) => a + b, 0) / deg.length;
    expect(s.summary.n).toBe(31);
    expect(s.summary.mean).toBeCloseTo(mean, 12);
    expect(s.capability.lsl).toBeCloseTo(-T, 12);
    expect(s.capability.usl).toBeCloseTo(T, 12);
    expect(s.capability.cpk).toBeCloseTo(Math.min(T - mean, mean + T) / (3 * s.summary.std), 10);
    expect(s.tolerance).toMatchObject({ dist: mag.placementTol.yawDeg.dist, tol: T });
    expect(s.normality.method).toBe("anderson-darling");
    expect(s.histogram.bins.reduce((a: number, b: any) => a + b.count, 0)).toBe(31);
    expect(s.outliers.rule).toMatch(/modified z-score/);

    // the bond line: absolute heights less the nominal 10 um
    const h = await t.call("GET", `/api/datasets/${id}/statistics?column=${encodeURIComponent("height [um]")}`, { cookie: rev });
    expect(h.body.unit).toBe("um");
    expect(h.body.summary.min).toBeCloseTo(-0.5, 12);
    expect(h.body.summary.max).toBeCloseTo(0.5, 12);

    // an unmapped column: its own unit, no capability; the outlier row is the file's row
    const tilt = await t.call("GET", `/api/datasets/${id}/statistics?column=${encodeURIComponent("tilt [deg]")}`, { cookie: rev });
    expect(tilt.body).toMatchObject({ unit: "deg", source: null, capability: null, converted: null });
    expect(tilt.body.outliers.values).toEqual([{ row: 32, value: 0.9, score: expect.any(Number) }]);

    const unknown = await t.call("GET", `/api/datasets/${id}/statistics?column=zzz`, { cookie: rev });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.code).toBe("unknown_column");
    const label = await t.call("GET", `/api/datasets/${id}/statistics?column=unit`, { cookie: rev });
    expect(label.body.error.code).toBe("not_numeric");
  });

  it("clearing a mapping, and deleting a data set", async () => {
    const res = await t.call("PATCH", `/api/datasets/${id}/mappings`, {
      cookie: eng,
      headers: await t.ifMatch(`/api/datasets/${id}`, eng),
      body: { mappings: [{ column: "height [um]", revisionId, source: null }] },
    });
    expect(res.body.columns.find((c: any) => c.key === "height [um]").mapping).toBeNull();
    const up = await uploadToProject("to-delete.csv", "v [um]\n1\n2\n");
    const del = await t.call("DELETE", `/api/datasets/${up.body.id}`, { cookie: eng, headers: { "if-match": `"${up.body.version}"` } });
    expect(del.status).toBe(204);
    expect((await t.call("GET", `/api/datasets/${up.body.id}`, { cookie: eng })).status).toBe(404);
  });
});

describe("suppliers send measurements through a released report of their own company", () => {
  async function report(status: "draft" | "released", supplierName: string) {
    const [s] = await t.handle.db.select().from(suppliers).where(eq(suppliers.name, supplierName));
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
        status,
        capability: { cpk: 1.33, overrides: {} },
        content: emptyReportContent({ projectId, revisionId, supplier: s }),
        releasedAt: status === "released" ? new Date() : null,
      })
      .returning();
    return r.id;
  }

  it("the supplier sends a file; engineers see who sent it, for which report, and when", async () => {
    const id = await report("released", "Larkfield Assembly");
    const res = await upload(`/api/reports/${id}/datasets`, sup, "larkfield-build1.csv", "die,yaw [deg]\nD1,0.02\nD2,-0.01\n");
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body).toMatchObject({
      projectId,
      uploadedByName: "Sam Whitcombe",
      uploadedByRole: "supplier",
      supplierName: "Larkfield Assembly",
    });
    expect(res.body.report).toMatchObject({ id, revision: 1 });
    const list = await t.call("GET", `/api/projects/${projectId}/datasets`, { cookie: eng });
    expect(list.body.datasets.find((d: any) => d.id === res.body.id)).toMatchObject({
      supplierName: "Larkfield Assembly",
      uploadedByName: "Sam Whitcombe",
    });
    const mine = await t.call("GET", `/api/reports/${id}/datasets`, { cookie: sup });
    expect(mine.status, JSON.stringify(mine.body)).toBe(200);
    expect(mine.body.datasets.map((d: any) => d.id)).toEqual([res.body.id]);
    const act = await t.call("GET", `/api/projects/${projectId}/activity`, { cookie: eng });
    expect(act.body.activity[0].summary).toMatch(
      /^sent the data set “larkfield-build1\.csv” \(2 rows, 1 measured column\) for report TR-\d{4} rev 1 \(Larkfield Assembly\)$/,
    );
    // the supplier reads nothing else of the workspace
    expect((await t.call("GET", `/api/datasets/${res.body.id}`, { cookie: sup })).status).toBe(403);
  });

  it("another company's report, or one not released, is not found for the supplier; nothing is stored", async () => {
    const before = await counts();
    const otherCo = await report("released", "Fenmoor Substrates");
    const draft = await report("draft", "Larkfield Assembly");
    for (const id of [otherCo, draft]) {
      const res = await upload(`/api/reports/${id}/datasets`, sup, "x.csv", "v [um]\n1\n2\n");
      expect(res.status, JSON.stringify(res.body)).toBe(404);
      expect((await t.call("GET", `/api/reports/${id}/datasets`, { cookie: sup })).status).toBe(404);
    }
    // staff see a draft, but measurements go against released reports only
    const eDraft = await upload(`/api/reports/${draft}/datasets`, eng, "x.csv", "v [um]\n1\n2\n");
    expect(eDraft.status).toBe(409);
    expect(await counts()).toEqual(before);
  });

  it("a refused supplier file is refused the same way", async () => {
    const id = await report("released", "Larkfield Assembly");
    const res = await upload(`/api/reports/${id}/datasets`, sup, "bad.csv", "die,yaw [deg]\nD1,abc\n");
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/^Row 2, column B \(yaw \[deg\]\): “abc” is not a number/);
  });
});

describe("as-built study requests that cannot run are refused before anything is queued", () => {
  let id: string;
  let study: Record<string, unknown>;
  beforeAll(async () => {
    const res = await uploadToProject("as-built-checks.csv", "unit,yaw [mrad],height [um],solo [deg]\nU1,1,10,0\nU2,-1,11,0\nU3,0.5,9,0\n");
    id = res.body.id;
    await t.call("PATCH", `/api/datasets/${id}/mappings`, {
      cookie: eng,
      headers: await t.ifMatch(`/api/datasets/${id}`, eng),
      body: { mappings: [{ column: "yaw [mrad]", revisionId, source: "mag.yaw" }] },
    });
    study = { ...JSON.parse(readFileSync(new URL("../fixtures/study-reference.json", import.meta.url), "utf8")), trials: 1000 };
  });

  const post = (asBuilt: unknown) => t.call("POST", `/api/revisions/${revisionId}/studies`, { cookie: eng, body: { study, asBuilt } });

  it("names the entry and field of each problem", async () => {
    const [{ n: before }] = await t.handle.db.select({ n: sql<number>`count(*)::int` }).from(studies);
    const cases: Array<[unknown, string, RegExp]> = [
      [
        [{ source: "mag.nothing", datasetId: id, column: "yaw [mrad]", mode: "resample" }],
        "asBuilt[0].source",
        /no tolerance source mag\.nothing/,
      ],
      [
        [{ source: "mag.bondLine", datasetId: id, column: "yaw [mrad]", mode: "resample" }],
        "asBuilt[0].source",
        /measures mag\.yaw; map it to mag\.bondLine first/,
      ],
      [[{ source: "mag.yaw", datasetId: id, column: "height [um]", mode: "normal" }], "asBuilt[0].column", /cannot replace mag\.yaw/],
      [[{ source: "mag.yaw", datasetId: id, column: "unit", mode: "normal" }], "asBuilt[0].column", /no measured column “unit”/],
      [[{ source: "calibration.mag", datasetId: id, column: "solo [deg]", mode: "normal" }], "asBuilt[0].source", /calibration residual/],
      [
        [
          { source: "mag.yaw", datasetId: id, column: "yaw [mrad]", mode: "normal" },
          { source: "mag.yaw", datasetId: id, column: "yaw [mrad]", mode: "resample" },
        ],
        "asBuilt[1].source",
        /replaced twice/,
      ],
      [[{ source: "mag.yaw", datasetId: id, column: "yaw [mrad]", mode: "both" }], "asBuilt[0].mode", /resample/],
    ];
    for (const [asBuilt, path, message] of cases) {
      const res = await post(asBuilt);
      expect(res.status, JSON.stringify(res.body)).toBe(400);
      expect(res.body.error.fields[0].path).toBe(path);
      expect(res.body.error.fields[0].message).toMatch(message);
    }
    const other = await t.call("POST", "/api/projects", { cookie: eng, body: { name: "elsewhere" } });
    const foreign = await uploadToProject("x.csv", "yaw [deg]\n1\n2\n");
    await t.handle.db.update(datasets).set({ projectId: other.body.id }).where(eq(datasets.id, foreign.body.id));
    const res = await post([{ source: "mag.yaw", datasetId: foreign.body.id, column: "yaw [deg]", mode: "normal" }]);
    expect(res.body.error.fields[0]).toEqual({
      path: "asBuilt[0].datasetId",
      message: "no data set with this id in the revision's project",
    });
    const [{ n: after }] = await t.handle.db.select({ n: sql<number>`count(*)::int` }).from(studies);
    expect(after).toBe(before);
  });
});

describe("the demo workspace", () => {
  it("has the first-build magnetometer data set, mapped to mag.yaw of revision 1", async () => {
    const [p] = await t.handle.db
      .select()
      .from(projects)
      .where(sql`${projects.name} like 'Ridgeline%'`);
    const list = await t.call("GET", `/api/projects/${p.id}/datasets`, { cookie: eng });
    const demo = list.body.datasets.find((d: any) => d.name === DEMO_DATASET_NAME);
    expect(demo).toMatchObject({
      rows: 48,
      mappedColumns: [{ column: "yaw [mrad]", source: "mag.yaw" }],
      uploadedByName: "Ezra Lindqvist",
    });
    const s = await t.call("GET", `/api/datasets/${demo.id}/statistics?column=${encodeURIComponent("yaw [mrad]")}`, { cookie: eng });
    // the re-picked unit RB1-031 is the one outlier, on row 32 of the file
    expect(s.body.outliers.values.map((o: any) => o.row)).toEqual([32]);
    expect(s.body.capability.cpk).toBeLessThan(1.33);
    const [r1] = await t.handle.db
      .select()
      .from(stackRevisions)
      .where(and(eq(stackRevisions.projectId, p.id), eq(stackRevisions.number, 1)));
    expect(r1).toBeTruthy();
  });
});
