/**
 * Issue 10, item 8: bad input is a 400 naming the field, never a 500. NUL characters in text
 * (PostgreSQL stores none), JSON nested 100,000 levels deep, impossible dates, empty numbers in
 * query strings, `__proto__` keys in bodies and as a column header, and spreadsheets whose zip
 * directory lies about their size or which hold a great many empty rows.
 */
import { readFileSync } from "node:fs";
import { crc32, deflateRawSync, constants } from "node:zlib";
import ExcelJS from "exceljs";
import { unzipSync, zipSync, strToU8, strFromU8 } from "fflate";
import { sql } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { datasets } from "@backend/db/schema";
import { startTestApp, type TestApp } from "../harness";
import { rawRequest } from "./raw-http";

const reference = JSON.parse(readFileSync(new URL("../../fixtures/stack-reference.json", import.meta.url), "utf8"));

let t: TestApp;
let engineer: string;
let reviewer: string;
let projectId: string;
let revisionId: string;

beforeAll(async () => {
  t = await startTestApp();
  engineer = await t.signIn("engineer@example.com");
  reviewer = await t.signIn("reviewer@example.com");
  const p = await t.call("POST", "/api/projects", { cookie: engineer, body: { name: "Bad input" } });
  projectId = p.body.id;
  const r = await t.call("POST", `/api/projects/${projectId}/revisions`, { cookie: engineer, body: { stack: reference } });
  expect(r.status, JSON.stringify(r.body)).toBe(201);
  revisionId = r.body.id;
}, 120_000);
afterAll(async () => t?.close());

const paths = (body: { error?: { fields?: { path: string }[] } }) => (body.error?.fields ?? []).map((f) => f.path);

function send(method: string, path: string, raw: string, cookie = engineer) {
  return rawRequest(t.url, method, path, {
    headers: { cookie, "content-type": "application/json", origin: t.deps.baseURL },
    body: raw,
  });
}

describe("NUL characters in text", () => {
  const nul = "bad\u0000name";
  it.each([
    ["a project name", "POST", () => "/api/projects", { name: nul }, "name"],
    ["a project description", "PATCH", () => `/api/projects/${projectId}`, { description: nul }, "description"],
    ["a supplier name", "POST", () => "/api/suppliers", { name: nul }, "name"],
    ["a revision note", "PATCH", () => `/api/revisions/${revisionId}`, { note: nul }, "note"],
    ["a comment", "POST", () => `/api/revisions/${revisionId}/comments`, { body: nul }, "body"],
    ["an element's name in a stack", "PATCH", () => `/api/revisions/${revisionId}`, { stack: { ...reference, name: nul } }, "stack.name"],
    [
      "a key inside the stack's meta",
      "PATCH",
      () => `/api/revisions/${revisionId}`,
      { stack: { ...reference, meta: { ["k\u0000"]: 1 } } },
      "stack.meta",
    ],
  ])("%s: 400 naming the field", async (_what, method, path, body, field) => {
    const cookie = path().startsWith("/api/suppliers") ? await t.signIn("admin@example.com") : engineer;
    const r = await t.call(method, path(), { cookie, body });
    expect(r.status, JSON.stringify(r.body)).toBe(400);
    expect(paths(r.body)).toContain(field);
  });

  it("in a query string: 400 naming the parameter", async () => {
    const r = await t.call("GET", "/api/projects?q=a%00b", { cookie: engineer });
    expect(r.status).toBe(400);
    expect(paths(r.body)).toEqual(["q"]);
  });

  it("the shared text schema refuses it wherever it is used (here a reviewer's return comment)", async () => {
    const r = await t.call("POST", `/api/revisions/${revisionId}/return`, { cookie: reviewer, body: { comment: nul } });
    // a draft cannot be returned: the body is read first, so the NUL is what answers
    expect(r.status).toBe(400);
    expect(paths(r.body)).toContain("comment");
  });
});

describe("JSON nested too deep", () => {
  it.each([100_000, 33])("%i levels: 400 before anything parses it", async (levels) => {
    const r = await send("POST", "/api/projects", `{"name":"deep","x":${"[".repeat(levels)}${"]".repeat(levels)}}`);
    expect(r.status, r.body.slice(0, 300)).toBe(400);
    expect(JSON.parse(r.body).error.message).toMatch(/nested more than 32 levels/);
  });

  it("brackets inside strings do not count, and a stack's own depth is well within the limit", async () => {
    const r = await send("POST", "/api/projects", JSON.stringify({ name: "[[[[".repeat(20), description: "{".repeat(500) }));
    expect(r.status, r.body).toBe(201);
    const meta = { a: { b: { c: { d: { e: [[[["deep enough"]]]] } } } } };
    const s = await t.call("PATCH", `/api/revisions/${revisionId}`, {
      cookie: engineer,
      body: { stack: { ...reference, meta } },
      headers: await t.ifMatch(`/api/revisions/${revisionId}`, engineer),
    });
    expect(s.status, JSON.stringify(s.body)).toBe(200);
  });
});

describe("__proto__ keys", () => {
  it("at the top of a body: 400, not silently dropped", async () => {
    const r = await send("POST", "/api/projects", '{"name":"proto","__proto__":{"isAdmin":true}}');
    expect(r.status, r.body).toBe(400);
    expect(paths(JSON.parse(r.body))).toEqual(["__proto__"]);
  });

  it("deep in a stack: 400 naming its path", async () => {
    const body = JSON.stringify({ stack: reference }).replace('"elements":[{', '"elements":[{"__proto__":{"kind":"gyro"},');
    const r = await send("PATCH", `/api/revisions/${revisionId}`, body);
    expect(r.status, r.body).toBe(400);
    expect(paths(JSON.parse(r.body))).toEqual(["stack.elements[0].__proto__"]);
  });

  it("in a query string: 400", async () => {
    const r = await t.call("GET", "/api/projects?__proto__=x", { cookie: engineer });
    expect(r.status).toBe(400);
    expect(paths(r.body)).toEqual(["__proto__"]);
  });
});

describe("dates and numbers in query strings", () => {
  const field = (q: string) => t.call("GET", `/api/geomagnetic-field?${q}`, { cookie: engineer });

  it("an impossible date (2026-02-30) is refused, a real one answered", async () => {
    const bad = await field("latitudeDeg=48&longitudeDeg=11&date=2026-02-30");
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields).toEqual([{ path: "date", message: "date is not a real calendar date" }]);
    expect((await field("latitudeDeg=48&longitudeDeg=11&date=2026-02-28")).status).toBe(200);
  });

  it.each(["latitudeDeg", "longitudeDeg", "altitudeKm"])("an empty %s is a 400, not 0", async (name) => {
    const q = new URLSearchParams({ latitudeDeg: "48", longitudeDeg: "11", altitudeKm: "0.5", date: "2026-03-01", [name]: "" });
    const r = await field(q.toString());
    expect(r.status).toBe(400);
    expect(paths(r.body)).toEqual([name]);
  });
});

describe("spreadsheet uploads", () => {
  async function upload(name: string, content: Buffer, retry = true): Promise<{ status: number; body: any }> {
    const form = new FormData();
    form.append("file", new Blob([new Uint8Array(content)]), name);
    try {
      const res = await fetch(`${t.url}/api/projects/${projectId}/datasets`, {
        method: "POST",
        headers: { origin: t.deps.baseURL, cookie: engineer },
        body: form,
      });
      return { status: res.status, body: await res.json() };
    } catch (err) {
      // building a file can outlast the server's keep-alive: the pooled connection was closed
      if (!retry) throw err;
      return upload(name, content, false);
    }
  }
  const stored = async () => (await t.handle.db.select({ n: sql<number>`count(*)::int` }).from(datasets))[0].n;

  it("a __proto__ column header: 400 naming the cell, nothing stored", async () => {
    const before = await stored();
    const r = await upload("tilt.csv", Buffer.from("unit,__proto__ [deg],tilt_y [deg]\nU1,0.1,0.2\nU2,0.3,0.1\n"));
    expect(r.status, JSON.stringify(r.body)).toBe(400);
    expect(paths(r.body)).toEqual(["Row 1, column B (__proto__ [deg])"]);
    expect(await stored()).toBe(before);
  });

  it("a NUL character in a cell: 400 naming the cell", async () => {
    // past the first 8 KB, which are checked for binary content as a whole
    const rows = Array.from({ length: 1000 }, (_, i) => `U${i},0.${i % 10}`).join("\n");
    const r = await upload("tilt.csv", Buffer.from(`unit,tilt_x [deg]\n${rows}\nU\u0000X,0.2\n`));
    expect(r.status, JSON.stringify(r.body)).toBe(400);
    expect(paths(r.body)).toEqual(["Row 1002, column A"]);
  });

  it("a workbook whose zip directory understates its size is measured by what it inflates to", async () => {
    // one entry of 130 MB of zeros, written as repeated deflate blocks; the directory says 1 KB
    const block = deflateRawSync(Buffer.alloc(1 << 20), { finishFlush: constants.Z_SYNC_FLUSH });
    const mb = 130;
    const data = Buffer.concat([...Array.from({ length: mb }, () => block), Buffer.from([0x03, 0x00])]);
    let crc = 0;
    for (let i = 0; i < mb; i++) crc = crc32(Buffer.alloc(1 << 20), crc);
    const name = Buffer.from("xl/worksheets/sheet1.xml");
    const local = Buffer.alloc(30);
    local.writeUInt32LE(0x04034b50, 0);
    local.writeUInt16LE(20, 4);
    local.writeUInt16LE(8, 8);
    local.writeUInt32LE(crc >>> 0, 14);
    local.writeUInt32LE(data.length, 18);
    local.writeUInt32LE(1024, 22); // the lie
    local.writeUInt16LE(name.length, 26);
    const central = Buffer.alloc(46);
    central.writeUInt32LE(0x02014b50, 0);
    central.writeUInt16LE(20, 4);
    central.writeUInt16LE(20, 6);
    central.writeUInt16LE(8, 10);
    central.writeUInt32LE(crc >>> 0, 16);
    central.writeUInt32LE(data.length, 20);
    central.writeUInt32LE(1024, 24); // the lie
    central.writeUInt16LE(name.length, 28);
    const end = Buffer.alloc(22);
    end.writeUInt32LE(0x06054b50, 0);
    end.writeUInt16LE(1, 8);
    end.writeUInt16LE(1, 10);
    end.writeUInt32LE(46 + name.length, 12);
    end.writeUInt32LE(30 + name.length + data.length, 16);
    const zip = Buffer.concat([local, name, data, central, name, end]);
    expect(zip.length).toBeLessThan(1 << 20);
    const r = await upload("bomb.xlsx", zip);
    expect(r.status, JSON.stringify(r.body)).toBe(400);
    expect(r.body.error.code).toBe("too_large");
    expect(paths(r.body)).toEqual(["file"]);
    expect((await t.call("GET", "/api/health")).status).toBe(200);
  });

  it("a sheet of a great many empty rows is refused by the rows it holds, not read to its end", async () => {
    const wb = new ExcelJS.Workbook();
    const ws = wb.addWorksheet("Build 1");
    ws.addRow(["unit", "tilt_x [deg]"]);
    ws.addRow(["U1", 0.1]);
    ws.addRow(["U2", 0.2]);
    const files = unzipSync(new Uint8Array(await wb.xlsx.writeBuffer()));
    const sheetPath = Object.keys(files).find((k) => k.startsWith("xl/worksheets/sheet"))!;
    const xml = strFromU8(files[sheetPath]);
    const empty = Array.from({ length: 400_010 }, (_, k) => `<row r="${k + 4}"/>`).join("");
    files[sheetPath] = strToU8(xml.replace("</sheetData>", `${empty}</sheetData>`).replace(/<dimension ref="[^"]*"\/>/, ""));
    const zip = Buffer.from(zipSync(files, { level: 9 }));
    expect(zip.length).toBeLessThan(5 << 20);
    const r = await upload("empty-rows.xlsx", zip);
    expect(r.status, JSON.stringify(r.body)).toBe(400);
    expect(r.body.error.code).toBe("too_many_rows");
  });
});
