import { execFileSync } from "node:child_process";
import { createHash } from "node:crypto";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { crc32, deflateSync } from "node:zlib";
import ExcelJS from "exceljs";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { members, suppliers, supplierContacts } from "@backend/db/schema";
import { SMTPServer } from "smtp-server";
import { mailSettings } from "@backend/lib/env";
import { createMailService, requireMail } from "@backend/services/mail";
import { outboxMessages } from "@backend/db/schema";
import { REPORT_CAUTIONS } from "@shared/reports/cautions";
import { createAccount } from "@backend/lib/accounts";
import { startTestApp, type TestApp } from "./harness";
import { insertFinishedStudy, LARKFIELD, ownedStack, parseCsv, resultFor } from "./report-fixtures";

// The server renders report files on a thread of its own (backend/services/report-renderer.ts),
// never on the thread that answers requests: a file rendered here would fail every download
// and release below.
vi.mock("@backend/services/report-render", () => ({
  renderFile: () => {
    throw new Error("a report file was rendered on the thread that answers requests");
  },
}));

const LARKFIELD_SOURCES = [
  "asic.bondLine",
  "asic.yaw",
  "gyro.bondLine",
  "gyro.yaw",
  "accel.bondLine",
  "accel.yaw",
  "mag.bondLine",
  "mag.yaw",
];

const tmp = mkdtempSync(join(tmpdir(), "orthostack-reports-"));
let fileNo = 0;
function pdfText(pdf: Buffer): string {
  const path = join(tmp, `r${++fileNo}.pdf`);
  writeFileSync(path, pdf);
  return execFileSync("pdftotext", ["-layout", path, "-"], { encoding: "utf8" });
}
const squash = (s: string) => s.replace(/\s+/g, " ").trim();
const sha = (b: Buffer) => createHash("sha256").update(b).digest("hex");

/** A small solid-colour PNG, encoded here so the test needs no image library. */
function png(w: number, h: number, rgb: [number, number, number]): string {
  const chunk = (type: string, data: Buffer) => {
    const len = Buffer.alloc(4);
    len.writeUInt32BE(data.length);
    const td = Buffer.concat([Buffer.from(type, "latin1"), data]);
    const crc = Buffer.alloc(4);
    crc.writeUInt32BE(crc32(td) >>> 0);
    return Buffer.concat([len, td, crc]);
  };
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(w, 0);
  ihdr.writeUInt32BE(h, 4);
  ihdr[8] = 8;
  ihdr[9] = 2;
  const row = Buffer.concat([Buffer.from([0]), Buffer.alloc(w * 3).fill(Buffer.from(rgb))]);
  const raw = Buffer.concat(Array.from({ length: h }, () => row));
  const file = Buffer.concat([
    Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    chunk("IHDR", ihdr),
    chunk("IDAT", deflateSync(raw)),
    chunk("IEND", Buffer.alloc(0)),
  ]);
  return `data:image/png;base64,${file.toString("base64")}`;
}

async function download(t: TestApp, path: string, cookie: string) {
  const res = await fetch(t.url + path, { headers: { cookie, origin: "http://localhost:3999" } });
  return { status: res.status, headers: res.headers, data: Buffer.from(await res.arrayBuffer()) };
}

async function until<T>(fn: () => Promise<T>, ok: (v: T) => boolean, ms = 10_000): Promise<T> {
  const end = Date.now() + ms;
  for (;;) {
    const v = await fn();
    if (ok(v)) return v;
    if (Date.now() > end) throw new Error(`timed out; last value ${JSON.stringify(v).slice(0, 300)}`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

describe("supplier reports", () => {
  let t: TestApp;
  const c: Record<string, string> = {};
  let workspaceId: string;
  let larkfieldId: string;
  let fixture: Awaited<ReturnType<typeof insertFinishedStudy>>;
  let reportId: string;

  beforeAll(async () => {
    t = await startTestApp({
      runner: (_i, { signal }) => new Promise((_r, reject) => signal.addEventListener("abort", () => reject(new Error("cancelled")))),
    });
    for (const role of ["admin", "engineer", "reviewer", "supplier"]) c[role] = await t.signIn(`${role}@example.com`);
    const [s] = await t.handle.db.select().from(suppliers).where(eq(suppliers.name, LARKFIELD));
    workspaceId = s.workspaceId;
    larkfieldId = s.id;
    fixture = await insertFinishedStudy(t.handle.db, { workspaceId });
  });
  afterAll(async () => {
    await t?.close();
    rmSync(tmp, { recursive: true, force: true });
  });

  it("builds a draft for Larkfield with its own tolerances, the capability asked and the sigma it implies", async () => {
    const r = await t.call("POST", `/api/studies/${fixture.studyId}/reports`, { cookie: c.engineer, body: { supplierId: larkfieldId } });
    expect(r.status, JSON.stringify(r.body)).toBe(201);
    reportId = r.body.id;
    expect(r.body).toMatchObject({
      code: "TR-0001",
      revision: 1,
      status: "draft",
      supplierName: LARKFIELD,
      cpk: 1.33,
      isLatest: true,
      files: [],
    });
    const tols = r.body.content.tolerances;
    // the owner "  larkfield ASSEMBLY " of mag.yaw matches too: case and spaces do not matter
    expect(tols.map((x: { source: string }) => x.source)).toEqual(LARKFIELD_SOURCES);
    const stack = ownedStack();
    const asic = stack.elements.find((e) => e.id === "asic")!;
    const asicBond = tols.find((x: { source: string }) => x.source === "asic.bondLine");
    expect(asicBond).toMatchObject({ tol: asic.bondLine!.heightTol!.tol, unit: "um", dist: "normal", sigmas: 3, cpk: 1.33, raised: false });
    expect(asicBond.sigmaMax).toBeCloseTo(asic.bondLine!.heightTol!.tol! / (3 * 1.33), 10);
    expect(asicBond.sigmaModelled).toBeCloseTo(asic.bondLine!.heightTol!.tol! / 3, 10);
    // the requirements carry the study's own predicted yields
    const result = resultFor(stack);
    expect(r.body.content.requirements.map((x: { predictedYield: number }) => x.predictedYield)).toEqual(
      result.requirements.map((x) => x.predictedYield),
    );
    const rel = r.body.content.requirements.find((x: { metric: string }) => x.metric === "accel~mag.relRotDeg");
    expect(rel.fed).toBe(true);
    expect(rel.supplierShare).toBeGreaterThan(0.5);
    expect(r.body.content.cautions).toEqual([...REPORT_CAUTIONS]);
    expect(r.body.link).toBe(`http://localhost:3999/reports/${reportId}`);
  });

  it("refuses a second draft for the same supplier, bad fields by name, and what cannot be reported", async () => {
    const again = await t.call("POST", `/api/studies/${fixture.studyId}/reports`, {
      cookie: c.engineer,
      body: { supplierId: larkfieldId },
    });
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe("draft_exists");

    const bad = await t.call("POST", `/api/studies/${fixture.studyId}/reports`, {
      cookie: c.engineer,
      body: { supplierId: "nope", cpk: 9, snapshotPng: "data:image/jpeg;base64,AAAA" },
    });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.map((f: { path: string }) => f.path).sort()).toEqual(["cpk", "snapshotPng", "supplierId"]);

    const other = await insertFinishedStudy(t.handle.db, { workspaceId });
    const foreign = await t.call("POST", `/api/studies/${other.studyId}/reports`, {
      cookie: c.engineer,
      body: { supplierId: larkfieldId, cpkOverrides: { "pkg.bow": 2 } },
    });
    expect(foreign.status).toBe(400);
    expect(foreign.body.error.fields).toEqual([{ path: "cpkOverrides.pkg.bow", message: expect.stringContaining("not one of Larkfield") }]);

    const notPng = await t.call("POST", `/api/studies/${other.studyId}/reports`, {
      cookie: c.engineer,
      body: { supplierId: larkfieldId, snapshotPng: "data:image/png;base64,AAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAA" },
    });
    expect(notPng.status).toBe(400);
    expect(notPng.body.error.fields[0].path).toBe("snapshotPng");

    const draftRev = await insertFinishedStudy(t.handle.db, { workspaceId, revisionStatus: "draft" });
    const r1 = await t.call("POST", `/api/studies/${draftRev.studyId}/reports`, { cookie: c.engineer, body: { supplierId: larkfieldId } });
    expect(r1.status).toBe(409);
    expect(r1.body.error).toMatchObject({ code: "not_reportable", message: expect.stringContaining("not approved") });

    const running = await insertFinishedStudy(t.handle.db, { workspaceId, studyStatus: "running" });
    const r2 = await t.call("POST", `/api/studies/${running.studyId}/reports`, { cookie: c.engineer, body: { supplierId: larkfieldId } });
    expect(r2.status).toBe(409);
    expect(r2.body.error.message).toContain("finished studies only");

    const [nobody] = await t.handle.db.insert(suppliers).values({ workspaceId, name: "Harrowgate Dies", kind: "die" }).returning();
    const r3 = await t.call("POST", `/api/studies/${other.studyId}/reports`, { cookie: c.engineer, body: { supplierId: nobody.id } });
    expect(r3.status).toBe(409);
    expect(r3.body.error.code).toBe("no_tolerances");

    // nothing was half-written by the refusals
    const list = await t.call("GET", `/api/reports?projectId=${other.projectId}`, { cookie: c.engineer });
    expect(list.body.reports).toEqual([]);
  });

  it("maps an owner written as the supplier's id", async () => {
    const stack = ownedStack();
    stack.elements.find((e) => e.id === "board")!.bowUm!.owner = larkfieldId;
    const f = await insertFinishedStudy(t.handle.db, { workspaceId, stack });
    const r = await t.call("POST", `/api/studies/${f.studyId}/reports`, { cookie: c.engineer, body: { supplierId: larkfieldId } });
    expect(r.status).toBe(201);
    expect(r.body.content.tolerances.map((x: { source: string }) => x.source)).toContain("board.bow");
    const options = await t.call("GET", `/api/projects/${f.projectId}/report-options`, { cookie: c.reviewer });
    expect(options.status).toBe(200);
    const s = options.body.studies[0];
    expect(s.blockedBy).toBeNull();
    expect(s.suppliers.find((x: { name: string }) => x.name === LARKFIELD)).toMatchObject({
      sources: expect.arrayContaining(["board.bow", "mag.yaw"]),
      contacts: 1,
      latest: { code: r.body.code, status: "draft" },
    });
    expect(s.unmatchedOwners.map((u: { owner: string }) => u.owner)).toContain("Sensor die fab (in-house)");
    // the build dialog says which targets the study misses, from its result
    const failing = resultFor(stack).requirements.filter((x) => !x.passes);
    expect(s.missed.map((m: { metric: string }) => m.metric)).toEqual(failing.map((x) => x.metric));
    expect(s.missed[0]).toMatchObject({ yield: failing[0].yield, predictedYield: failing[0].predictedYield });
    expect(s.missed[0].label).not.toBe(failing[0].metric);
  });

  it("changes a draft, and a tolerance the study sampled tighter raises the capability asked", async () => {
    const stack = ownedStack();
    stack.elements.find((e) => e.id === "gyro")!.bondLine!.heightTol!.sigmas = 6;
    const f = await insertFinishedStudy(t.handle.db, { workspaceId, stack });
    const r = await t.call("POST", `/api/studies/${f.studyId}/reports`, {
      cookie: c.engineer,
      body: { supplierId: larkfieldId, cpk: 1.5, snapshotPng: png(40, 30, [23, 33, 43]) },
    });
    expect(r.status).toBe(201);
    expect(r.body.hasSnapshot).toBe(true);
    const gyro = r.body.content.tolerances.find((x: { source: string }) => x.source === "gyro.bondLine");
    expect(gyro).toMatchObject({ cpkChosen: 1.5, raised: true });
    expect(gyro.cpk).toBeCloseTo(2, 10);
    const p = await t.call("PATCH", `/api/reports/${r.body.id}`, {
      cookie: c.engineer,
      body: { cpk: 1.67, cpkOverrides: { "asic.yaw": 2.0 }, snapshotPng: null, note: "Line 2" },
      headers: { "if-match": r.headers.get("etag")! },
    });
    expect(p.status).toBe(200);
    expect(p.body).toMatchObject({
      cpk: 1.67,
      note: "Line 2",
      hasSnapshot: false,
      capability: { cpk: 1.67, overrides: { "asic.yaw": 2 } },
    });
    const yaw = p.body.content.tolerances.find((x: { source: string }) => x.source === "asic.yaw");
    expect(yaw.sigmaMax).toBeCloseTo(yaw.tol / 6, 10);
    const pdf = await download(t, `/api/reports/${r.body.id}/pdf`, c.engineer);
    expect(pdf.status).toBe(200);
    expect(pdf.headers.get("x-content-sha256")).toBeNull();
    expect(pdfText(pdf.data)).toContain("DRAFT");
    const del = await t.call("DELETE", `/api/reports/${r.body.id}`, {
      cookie: c.engineer,
      headers: { "if-match": p.headers.get("etag")! },
    });
    expect(del.status).toBe(204);
    expect((await t.call("GET", `/api/reports/${r.body.id}`, { cookie: c.engineer })).status).toBe(404);
  });

  it("keeps a draft from the supplier entirely", async () => {
    expect((await t.call("GET", `/api/reports/${reportId}`, { cookie: c.supplier })).status).toBe(404);
    expect((await download(t, `/api/reports/${reportId}/pdf`, c.supplier)).status).toBe(404);
    const list = await t.call("GET", "/api/reports", { cookie: c.supplier });
    expect(list.status).toBe(200);
    expect(list.body.reports).toEqual([]);
  });

  it("a reviewer releases it: frozen, with each file stored once and its SHA-256", async () => {
    const internal = await t.call("POST", `/api/reports/${reportId}/comments`, {
      cookie: c.engineer,
      body: { body: "Internal: check the mag yaw against the jig." },
    });
    expect(internal.status).toBe(201);
    expect((await t.call("POST", `/api/reports/${reportId}/release`, { cookie: c.engineer, body: {} })).status).toBe(403);
    const r = await t.call("POST", `/api/reports/${reportId}/release`, {
      cookie: c.reviewer,
      body: { comment: "Checked against the approved revision." },
      headers: await t.ifMatch(`/api/reports/${reportId}`, c.reviewer),
    });
    expect(r.status, JSON.stringify(r.body)).toBe(200);
    expect(r.body).toMatchObject({ status: "released", releasedByName: "Rana Haddad" });
    expect(r.body.files.map((f: { kind: string }) => f.kind)).toEqual(["csv", "pdf", "xlsx"]);
    for (const f of r.body.files) expect(f.sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(r.body.comments.at(-1)).toMatchObject({ kind: "released", body: "Checked against the approved revision." });

    const first = await download(t, `/api/reports/${reportId}/pdf`, c.engineer);
    const second = await download(t, `/api/reports/${reportId}/pdf`, c.reviewer);
    const stored = r.body.files.find((f: { kind: string }) => f.kind === "pdf");
    expect(sha(first.data)).toBe(stored.sha256);
    expect(first.headers.get("x-content-sha256")).toBe(stored.sha256);
    expect(second.data.equals(first.data)).toBe(true);
    expect(first.headers.get("content-disposition")).toContain("TR-0001-r1-Larkfield-Assembly.pdf");

    const current = await t.ifMatch(`/api/reports/${reportId}`, c.engineer);
    expect(
      (await t.call("POST", `/api/reports/${reportId}/release`, { cookie: c.reviewer, body: {}, headers: current })).body.error.code,
    ).toBe("report_frozen");
    expect(
      (await t.call("PATCH", `/api/reports/${reportId}`, { cookie: c.engineer, body: { cpk: 2 }, headers: current })).body.error.code,
    ).toBe("report_frozen");
    expect((await t.call("DELETE", `/api/reports/${reportId}`, { cookie: c.engineer })).status).toBe(409);
  });

  it("the PDF holds the supplier's tolerances, the requirements and the cautions", async () => {
    const report = (await t.call("GET", `/api/reports/${reportId}`, { cookie: c.engineer })).body;
    const text = pdfText((await download(t, `/api/reports/${reportId}/pdf`, c.engineer)).data);
    const flat = squash(text);
    for (const s of LARKFIELD_SOURCES) expect(text).toContain(s);
    for (const tol of report.content.tolerances) expect(text).toContain(`±${tol.tol}${tol.unit === "deg" ? "°" : " µm"}`);
    expect(flat).toContain("Larkfield Assembly");
    expect(flat).toContain("TR-0001");
    expect(flat).toContain("RELEASED");
    expect(flat).toContain("Cpk ≥ 1.33");
    for (const caution of REPORT_CAUTIONS) expect(flat).toContain(caution);
    // other companies' sources are not the supplier's to hold: they are not in its table
    expect(text).not.toMatch(/pkg\.bow\s+pkg/);
  });

  it("the PDF gives each source its nominal and datum, a drawing to a stated scale with the stack's dimensions, and a measurement plan", async () => {
    const stack = ownedStack();
    const el = (id: string) => stack.elements.find((e) => e.id === id)!;
    const text = pdfText((await download(t, `/api/reports/${reportId}/pdf`, c.engineer)).data);
    const flat = squash(text);
    // nominals beside the tolerances, from the stack file: bond-line thickness and yaw
    const gyroRow = flat.slice(flat.indexOf("gyro.bondLine"), flat.indexOf("gyro.yaw"));
    expect(gyroRow).toContain(`${el("gyro").bondLine!.thicknessUm!.toFixed(1)} µm`);
    expect(gyroRow).toContain("datum: asic's top face");
    const magYaw = flat.slice(flat.indexOf("mag.yaw"));
    expect(magYaw).toContain(`${el("mag").yawDeg!.toFixed(3)}°`);
    // the drawing: every die's size and position on its parent, the bond lines, the scale stated
    expect(flat).toContain("Dimensions of the stack");
    for (const id of ["pkg", "asic", "gyro", "accel", "mag"]) {
      const e = el(id);
      expect(flat).toContain(`${e.size.x.toFixed(3)} × ${e.size.y.toFixed(3)} × ${e.size.z.toFixed(3)}`);
      const pos = (v: number) => v.toFixed(3).replace("-", "−");
      expect(flat).toContain(`x ${pos(e.position!.x)}, y ${pos(e.position!.y)} mm from ${e.parent}'s centre`);
      expect(flat).toContain(`${id} ${e.size.z.toFixed(3)} mm thick on ${e.bondLine!.thicknessUm!.toFixed(1)} µm bond line`);
    }
    // the top of the stack is the sum of every thickness and bond line from the board up
    const top = ["pkg", "asic", "gyro", "accel", "mag"].reduce((z, id) => z + el(id).size.z + el(id).bondLine!.thicknessUm! / 1000, 0);
    expect(flat).toContain(`top at ${top.toFixed(3)} mm`);
    expect(flat).toMatch(/Top view, looking down on the board · scale \d+:1/);
    expect(flat).toMatch(/Side section along x, looking along \+y · scale \d+:1/);
    // the measurement plan: sample size, the window from nominal ± tolerance, how to send it back
    expect(flat).toContain("Measurement plan");
    expect(flat).toContain("125 production units");
    const gyroBond = el("gyro").bondLine!;
    const lo = (gyroBond.thicknessUm! - gyroBond.heightTol!.tol!).toFixed(1);
    const hi = (gyroBond.thicknessUm! + gyroBond.heightTol!.tol!).toFixed(1);
    expect(flat).toContain(`${lo} – ${hi} µm`);
    expect(flat).toContain("How to send it back");
    expect(flat).toContain("with the lot number and a note");
  });

  it("the spreadsheet and the CSV read back with the same numbers", async () => {
    const report = (await t.call("GET", `/api/reports/${reportId}`, { cookie: c.engineer })).body;
    const xlsx = await download(t, `/api/reports/${reportId}/xlsx`, c.engineer);
    expect(xlsx.status).toBe(200);
    expect(sha(xlsx.data)).toBe(report.files.find((f: { kind: string }) => f.kind === "xlsx").sha256);
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(xlsx.data as unknown as ArrayBuffer);
    // one sheet per unit, the unit and the resolution in every numeric header, limits from the nominal
    const um = report.content.tolerances.filter((x: { unit: string }) => x.unit === "um");
    const ws = wb.getWorksheet("Tolerances um")!;
    const header = (ws.getRow(1).values as unknown[]).slice(1);
    const col = (name: string) => {
      expect(header, name).toContain(name);
      return header.indexOf(name) + 1;
    };
    const stack = ownedStack();
    um.forEach((tol: { source: string; elementId: string; tol: number; sigmaMax: number; cpk: number }, i: number) => {
      const row = ws.getRow(i + 2);
      const thickness = stack.elements.find((e) => e.id === tol.elementId)!.bondLine!.thicknessUm!;
      expect(row.getCell(col("Source")).value).toBe(tol.source);
      expect(row.getCell(col("Nominal (um, to 0.1)")).value).toBe(thickness);
      expect(row.getCell(col("Tolerance ± (um, to 0.1)")).value).toBe(tol.tol);
      expect(row.getCell(col("Lower limit (um, to 0.1)")).value).toBe(thickness - tol.tol);
      expect(row.getCell(col("Upper limit (um, to 0.1)")).value).toBe(thickness + tol.tol);
      expect(row.getCell(col("Sigma max (um, to 0.01)")).value).toBe(Math.round(tol.sigmaMax * 100) / 100);
      expect(row.getCell(col("Cpk asked (to 0.01)")).value).toBeCloseTo(tol.cpk, 2);
      expect(String(row.getCell(col("Datum")).value)).toMatch(/top face, under .*'s supports at the four corners/);
    });
    expect(ws.getColumn(col("Nominal (um, to 0.1)")).numFmt).toBe("0.0");
    const deg = wb.getWorksheet("Tolerances deg")!;
    const magYaw = (deg.getSheetValues() as unknown[][]).find((r) => r?.[1] === "mag.yaw")!;
    const degHeader = (deg.getRow(1).values as unknown[]).slice(1);
    expect(magYaw[degHeader.indexOf("Nominal (deg, to 0.001)") + 1]).toBe(stack.elements.find((e) => e.id === "mag")!.yawDeg);
    const elements = wb.getWorksheet("Elements")!;
    const elHeader = (elements.getRow(1).values as unknown[]).slice(1);
    const gyroRow = (elements.getSheetValues() as unknown[][]).find((r) => r?.[1] === "gyro")!;
    const gyro = stack.elements.find((e) => e.id === "gyro")!;
    expect(gyroRow[elHeader.indexOf("Size x (mm, to 0.001)") + 1]).toBe(gyro.size.x);
    expect(gyroRow[elHeader.indexOf("Position x on parent (mm, to 0.001)") + 1]).toBe(gyro.position!.x);
    expect(gyroRow[elHeader.indexOf("Bond-line thickness (um, to 0.1)") + 1]).toBe(gyro.bondLine!.thicknessUm);
    expect(wb.getWorksheet("Measurement plan")).toBeTruthy();
    const req = wb.getWorksheet("Requirements")!;
    report.content.requirements.forEach((r: { metric: string; predictedYield: number }, i: number) => {
      expect(req.getRow(i + 2).getCell(2).value).toBe(r.metric);
      expect(req.getRow(i + 2).getCell(7).value).toBeCloseTo(r.predictedYield, 6);
    });

    const csv = (await download(t, `/api/reports/${reportId}/csv`, c.engineer)).data.toString("utf8");
    expect(csv.charCodeAt(0)).toBe(0xfeff);
    const rows = parseCsv(csv.slice(1));
    const start = rows.findIndex((r) => r.length === 1 && r[0] === "Tolerances um");
    const head = rows[start + 1];
    for (const [i, tol] of um.entries()) {
      const cells = rows[start + 2 + i];
      expect(cells[head.indexOf("Source")]).toBe(tol.source);
      // the nominal and its datum beside the tolerance, as in the spreadsheet
      const thickness = stack.elements.find((e) => e.id === tol.elementId)!.bondLine!.thicknessUm!;
      expect(Number(cells[head.indexOf("Nominal (um, to 0.1)")])).toBe(thickness);
      expect(cells[head.indexOf("Datum")]).toMatch(/top face, under .*'s supports at the four corners/);
      expect(Number(cells[head.indexOf("Tolerance ± (um, to 0.1)")])).toBe(tol.tol);
      expect(Number(cells[head.indexOf("Sigma max (um, to 0.01)")])).toBe(Math.round(tol.sigmaMax * 100) / 100);
      // rounded as stated: no more decimals than the header's resolution
      for (const k of head.keys()) if (/\(um, to 0\.1\)/.test(head[k]) && cells[k]) expect(cells[k]).toMatch(/^-?\d+(\.\d)?$/);
    }
    expect(rows.find((r) => r[0] === "Resolution")?.[1]).toContain("dimensions in mm to 0.001");
    expect(csv).toContain(REPORT_CAUTIONS[1]);
  });

  it("sends the released report: each contact gets the link and the PDF, caught by the local catcher", async () => {
    await t.handle.db.insert(supplierContacts).values({ supplierId: larkfieldId, name: "Priya Anand", email: "quality@larkfield.example" });
    const r = await t.call("POST", `/api/reports/${reportId}/send`, { cookie: c.engineer, body: { message: "Please confirm by Friday." } });
    expect(r.status, JSON.stringify(r.body)).toBe(200);
    expect(r.body.sent.map((s: { email: string }) => s.email).sort()).toEqual(["quality@larkfield.example", "supplier@example.com"]);
    expect(r.body.failed).toEqual([]);
    expect(r.body.report.sends[0].recipients).toHaveLength(2);

    const outbox = await until(
      () => t.call("GET", "/api/outbox", { cookie: c.admin }),
      (x) => x.body.messages.filter((m: { subject: string }) => m.subject.startsWith("TR-0001 revision 1: tolerances")).length === 2,
    );
    expect(outbox.body.mode).toBe("catcher");
    const stored = r.body.report.files.find((f: { kind: string }) => f.kind === "pdf");
    const msg = outbox.body.messages.find((m: { to: string[] }) => m.to.includes("supplier@example.com"));
    expect(msg.subject).toBe("TR-0001 revision 1: tolerances for " + r.body.report.projectName);
    expect(msg.text).toContain(`http://localhost:3999/reports/${reportId}`);
    expect(msg.text).toContain("Please confirm by Friday.");
    expect(msg.text).toContain(stored.sha256);
    expect(msg.attachments).toEqual([
      { index: 0, fileName: "TR-0001-r1-Larkfield-Assembly.pdf", contentType: "application/pdf", size: stored.size },
    ]);
    const att = await download(t, `/api/outbox/${msg.id}/attachments/0`, c.admin);
    expect(sha(att.data)).toBe(stored.sha256);
    expect((await download(t, `/api/outbox/${msg.id}/attachments/3`, c.admin)).status).toBe(404);
  });

  it("the engineer chooses which contacts receive it, copies in an address and picks the attachments; bad choices are named by field", async () => {
    const supplier = (await t.call("GET", "/api/suppliers", { cookie: c.engineer })).body.suppliers.find(
      (s: { id: string }) => s.id === larkfieldId,
    );
    const priya = supplier.contacts.find((x: { email: string }) => x.email === "quality@larkfield.example");
    const bad = await t.call("POST", `/api/reports/${reportId}/send`, {
      cookie: c.engineer,
      body: { contactIds: [priya.id, "00000000-0000-4000-8000-000000000000"], cc: ["not-an-address"], attachments: ["pdf", "docx"] },
    });
    expect(bad.status).toBe(400);
    const paths = bad.body.error.fields.map((f: { path: string }) => f.path);
    expect(paths).toEqual(expect.arrayContaining(["cc[0]", "attachments[1]"]));
    const stranger = await t.call("POST", `/api/reports/${reportId}/send`, {
      cookie: c.engineer,
      body: { contactIds: [priya.id, "00000000-0000-4000-8000-000000000000"] },
    });
    expect(stranger.status).toBe(400);
    expect(stranger.body.error.fields).toEqual([{ path: "contactIds[1]", message: "not a contact of Larkfield Assembly" }]);
    expect((await t.call("POST", `/api/reports/${reportId}/send`, { cookie: c.engineer, body: { contactIds: [] } })).status).toBe(400);

    const r = await t.call("POST", `/api/reports/${reportId}/send`, {
      cookie: c.engineer,
      body: { contactIds: [priya.id], cc: ["Buyer@Example.com", "quality@larkfield.example"], attachments: ["xlsx", "csv"] },
    });
    expect(r.status, JSON.stringify(r.body)).toBe(200);
    // the contact once, the CC once (an address already among the contacts is not copied twice), lower-cased
    expect(r.body.sent).toEqual([
      { name: "Priya Anand", email: "quality@larkfield.example" },
      { name: "buyer@example.com", email: "buyer@example.com", cc: true },
    ]);
    expect(r.body.report.sends[0].attachments).toEqual(["xlsx", "csv"]);
    const files = r.body.report.files as Array<{ kind: string; fileName: string; size: number }>;
    const subjects = (m: { subject: string }) => m.subject.includes("TR-0001 revision 1: tolerances");
    const outbox = await until(
      () => t.call("GET", "/api/outbox", { cookie: c.admin }),
      (x) => x.body.messages.filter(subjects).length === 4,
    );
    const mine = outbox.body.messages.filter(subjects).slice(0, 2);
    const copy = mine.find((m: { to: string[] }) => m.to.includes("buyer@example.com"));
    const toPriya = mine.find((m: { to: string[] }) => m.to.includes("quality@larkfield.example"));
    expect(copy.subject.startsWith("Copy: ")).toBe(true);
    expect(copy.text).toContain("A copy of the message sent to Priya Anand at Larkfield Assembly.");
    expect(toPriya.text).toContain("The spreadsheet and the CSV are attached.");
    for (const m of [copy, toPriya])
      expect(m.attachments.map((a: { fileName: string; size: number }) => [a.fileName, a.size])).toEqual(
        ["xlsx", "csv"].map((k) => {
          const f = files.find((x) => x.kind === k)!;
          return [f.fileName, f.size];
        }),
      );
    // the other contact got nothing this time
    expect(mine.some((m: { to: string[] }) => m.to.includes("supplier@example.com"))).toBe(false);
  });

  it("a draft cannot be sent", async () => {
    const f = await insertFinishedStudy(t.handle.db, { workspaceId });
    const d = await t.call("POST", `/api/studies/${f.studyId}/reports`, { cookie: c.engineer, body: { supplierId: larkfieldId } });
    const s = await t.call("POST", `/api/reports/${d.body.id}/send`, { cookie: c.engineer, body: {} });
    expect(s.status).toBe(409);
    expect(s.body.error.code).toBe("not_released");
  });

  it("the supplier sees it, downloads it (recorded), asks a question and acknowledges it once", async () => {
    const list = await t.call("GET", "/api/reports", { cookie: c.supplier });
    expect(list.body.reports.map((r: { id: string }) => r.id)).toEqual([reportId]);
    const view = await t.call("GET", `/api/reports/${reportId}`, { cookie: c.supplier });
    expect(view.status).toBe(200);
    expect(view.body.sends).toEqual([]);
    expect(view.body.downloads).toEqual([]);
    // review notes on the draft and the release note stay internal
    expect(view.body.comments).toEqual([]);
    const pdf = await download(t, `/api/reports/${reportId}/pdf`, c.supplier);
    expect(pdf.status).toBe(200);
    expect(sha(pdf.data)).toBe(view.body.files.find((f: { kind: string }) => f.kind === "pdf").sha256);

    const q = await t.call("POST", `/api/reports/${reportId}/comments`, {
      cookie: c.supplier,
      body: { body: "Is the mag bond line measured at the corners or the centre?" },
    });
    expect(q.status).toBe(201);
    expect(q.body.comments.at(-1)).toMatchObject({ kind: "question", authorName: "Sam Whitcombe" });
    const answer = await t.call("POST", `/api/reports/${reportId}/comments`, {
      cookie: c.engineer,
      body: { body: "At the three supports, as drawn." },
    });
    expect(answer.body.comments.map((x: { body: string }) => x.body)).toContain("Internal: check the mag yaw against the jig.");
    const thread = (await t.call("GET", `/api/reports/${reportId}`, { cookie: c.supplier })).body.comments.map(
      (x: { body: string }) => x.body,
    );
    expect(thread).toEqual(["Is the mag bond line measured at the corners or the centre?", "At the three supports, as drawn."]);
    const empty = await t.call("POST", `/api/reports/${reportId}/comments`, { cookie: c.supplier, body: { body: "  " } });
    expect(empty.status).toBe(400);
    expect(empty.body.error.fields[0].path).toBe("body");

    expect((await t.call("POST", `/api/reports/${reportId}/acknowledge`, { cookie: c.engineer, body: {} })).status).toBe(403);
    const ack = await t.call("POST", `/api/reports/${reportId}/acknowledge`, {
      cookie: c.supplier,
      body: { comment: "Line 2 holds these." },
      headers: await t.ifMatch(`/api/reports/${reportId}`, c.supplier),
    });
    expect(ack.status).toBe(200);
    expect(ack.body.acknowledgedByName).toBe("Sam Whitcombe");
    expect(Date.parse(ack.body.acknowledgedAt)).toBeGreaterThan(Date.now() - 60_000);
    const twice = await t.call("POST", `/api/reports/${reportId}/acknowledge`, {
      cookie: c.supplier,
      body: {},
      headers: await t.ifMatch(`/api/reports/${reportId}`, c.supplier),
    });
    expect(twice.status).toBe(409);
    expect(twice.body.error.code).toBe("already_acknowledged");

    const staff = await t.call("GET", `/api/reports/${reportId}`, { cookie: c.engineer });
    expect(staff.body.downloads.some((d: { role: string; kind: string }) => d.role === "supplier" && d.kind === "pdf")).toBe(true);
  });

  it("refuses a supplier of another company everything about the report", async () => {
    const [other] = await t.handle.db
      .insert(suppliers)
      .values({ workspaceId, name: "Fenmoor Substrates Two", kind: "substrate" })
      .returning();
    const fenUser = await createAccount(t.deps.auth, { email: "fen@example.com", password: "orthostack-demo", name: "Fen Supplier" });
    await t.handle.db.insert(members).values({ workspaceId, userId: fenUser.id, role: "supplier", supplierId: other.id });
    const fen = await t.signIn("fen@example.com");
    expect((await t.call("GET", "/api/reports", { cookie: fen })).body.reports).toEqual([]);
    for (const [method, path] of [
      ["GET", `/api/reports/${reportId}`],
      ["GET", `/api/reports/${reportId}/pdf`],
      ["GET", `/api/reports/${reportId}/xlsx`],
      ["POST", `/api/reports/${reportId}/acknowledge`],
      ["POST", `/api/reports/${reportId}/comments`],
    ] as const) {
      const r = await t.call(method, path, { cookie: fen, body: method === "POST" ? { body: "hello" } : undefined });
      expect(r.status, `${method} ${path}`).toBe(404);
    }
    for (const [method, path] of [
      ["POST", `/api/reports/${reportId}/release`],
      ["POST", `/api/reports/${reportId}/send`],
      ["PATCH", `/api/reports/${reportId}`],
      ["POST", `/api/studies/${fixture.studyId}/reports`],
      ["GET", "/api/outbox"],
    ] as const) {
      const r = await t.call(method, path, { cookie: fen, body: method === "GET" ? undefined : { supplierId: other.id } });
      expect(r.status, `${method} ${path}`).toBe(403);
    }
  });

  it("shows release, send, the supplier's download and the acknowledgement on the project", async () => {
    const a = await t.call("GET", `/api/projects/${fixture.projectId}/activity`, { cookie: c.reviewer });
    const actions = a.body.activity.map((x: { action: string }) => x.action);
    for (const action of [
      "report.created",
      "report.released",
      "report.sent",
      "report.downloaded",
      "report.question",
      "report.acknowledged",
    ])
      expect(actions).toContain(action);
    const ack = a.body.activity.find((x: { action: string }) => x.action === "report.acknowledged");
    expect(ack).toMatchObject({ actorName: "Sam Whitcombe", summary: expect.stringContaining("acknowledged report TR-0001 revision 1") });
  });

  it("a change after release is a new revision of the same report number", async () => {
    const r = await t.call("POST", `/api/studies/${fixture.studyId}/reports`, {
      cookie: c.engineer,
      body: { supplierId: larkfieldId, cpk: 1.67 },
    });
    expect(r.status).toBe(201);
    expect(r.body).toMatchObject({ code: "TR-0001", revision: 2, status: "draft", isLatest: true });
    expect(r.body.history.map((h: { revision: number }) => h.revision)).toEqual([2, 1]);
    const staff = await t.call("GET", `/api/reports?projectId=${fixture.projectId}`, { cookie: c.engineer });
    expect(staff.body.reports.map((x: { revision: number; isLatest: boolean }) => [x.revision, x.isLatest])).toEqual([
      [2, true],
      [1, false],
    ]);
    // the supplier does not see the draft revision, so revision 1 is still its latest
    const sup = await t.call("GET", "/api/reports", { cookie: c.supplier });
    expect(sup.body.reports.map((x: { revision: number; isLatest: boolean }) => [x.revision, x.isLatest])).toEqual([[1, true]]);
    const released = await t.call("GET", `/api/reports/${reportId}`, { cookie: c.engineer });
    expect(released.body.content.capability.cpk).toBe(1.33);
  });

  it("invitations go out by mail through the same catcher, and the link stays on the admin page", async () => {
    const inv = await t.call("POST", "/api/invitations", {
      cookie: c.admin,
      body: { email: "new.engineer@example.com", role: "engineer" },
    });
    expect(inv.status).toBe(201);
    expect(inv.body.mailed).toBe(true);
    expect(inv.body.link).toMatch(/\/invite\//);
    const outbox = await until(
      () => t.call("GET", "/api/outbox", { cookie: c.admin }),
      (x) => x.body.messages.some((m: { to: string[] }) => m.to.includes("new.engineer@example.com")),
    );
    const msg = outbox.body.messages.find((m: { to: string[] }) => m.to.includes("new.engineer@example.com"));
    expect(msg.subject).toBe("Kestrel Wearables invites you to Orthostack");
    expect(msg.text).toContain(inv.body.link);
    const listed = await t.call("GET", "/api/invitations", { cookie: c.admin });
    expect(listed.body.invitations.find((i: { email: string }) => i.email === "new.engineer@example.com").link).toBe(inv.body.link);
  });

  it("the catcher keeps non-ASCII subjects and attachment names as they were sent", async () => {
    await requireMail(t.deps.mail).send({
      workspaceId,
      to: "prüfer@example.com",
      subject: "Prüfbericht µ-Lage: ±0.3° — σ ≤ 0.075°",
      text: "Grüße",
      attachments: [{ filename: "Prüfbericht µ.csv", content: Buffer.from("a,b\n1,2\n"), contentType: "text/csv" }],
    });
    const outbox = await until(
      () => t.call("GET", "/api/outbox", { cookie: c.admin }),
      (x) => x.body.messages.some((m: { subject: string }) => m.subject.startsWith("Prüfbericht")),
    );
    const msg = outbox.body.messages.find((m: { subject: string }) => m.subject.startsWith("Prüfbericht"));
    expect(msg.subject).toBe("Prüfbericht µ-Lage: ±0.3° — σ ≤ 0.075°");
    expect(msg.text.trim()).toBe("Grüße");
    expect(msg.attachments).toEqual([{ index: 0, fileName: "Prüfbericht µ.csv", contentType: "text/csv", size: 8 }]);
  });
});

describe("mail settings", () => {
  it("uses the local catcher without SMTP settings, and the server from SMTP_URL or SMTP_HOST otherwise", () => {
    expect(mailSettings({})).toEqual({ mode: "catcher", from: "Orthostack <orthostack@localhost>", port: 0 });
    expect(mailSettings({ SMTP_URL: "smtps://u:p@mail.example.com:465", MAIL_FROM: "Kestrel <reports@kestrel.example>" })).toEqual({
      mode: "smtp",
      from: "Kestrel <reports@kestrel.example>",
      transport: "smtps://u:p@mail.example.com:465",
    });
    expect(mailSettings({ SMTP_HOST: "mail.example.com", SMTP_PORT: "465", SMTP_USER: "u", SMTP_PASS: "p" })).toMatchObject({
      mode: "smtp",
      transport: { host: "mail.example.com", port: 465, secure: true, auth: { user: "u", pass: "p" } },
    });
    expect(mailSettings({ SMTP_HOST: "mail.example.com" })).toMatchObject({ transport: { port: 587, secure: false } });
    expect(() => mailSettings({ SMTP_URL: "http://mail.example.com" })).toThrow(/SMTP_URL must start with smtp/);
    expect(() => mailSettings({ SMTP_PORT: "99999" })).toThrow(/SMTP_PORT/);
  });

  it("with an SMTP server configured, mail goes there and the catcher stores nothing", async () => {
    const received: string[] = [];
    const server = new SMTPServer({
      authOptional: true,
      disabledCommands: ["STARTTLS"],
      disableReverseLookup: true,
      logger: false,
      onData(stream, _session, cb) {
        let raw = "";
        stream.on("data", (d: Buffer) => (raw += d.toString("latin1")));
        stream.on("end", () => {
          received.push(raw);
          cb();
        });
      },
    });
    await new Promise<void>((r) => server.listen(0, "127.0.0.1", () => r()));
    const port = (server.server.address() as { port: number }).port;
    const t = await startTestApp({ seed: false, mailEnv: { SMTP_URL: `smtp://127.0.0.1:${port}?ignoreTLS=true` } });
    try {
      // the runtime read SMTP_URL: no catcher, mail leaves through the server
      const mail = requireMail(t.deps.mail);
      expect(mail.mode).toBe("smtp");
      expect(mail.address).toBe(`127.0.0.1:${port}`);
      await mail.send({
        workspaceId: "00000000-0000-4000-8000-000000000000",
        to: "someone@example.com",
        subject: "Through the real server",
        text: "hello",
      });
      expect(received).toHaveLength(1);
      expect(received[0]).toContain("Subject: Through the real server");
      expect(await t.handle.db.select().from(outboxMessages)).toEqual([]);
      const direct = await createMailService(
        t.handle.db,
        { mode: "smtp", from: "Orthostack <o@example.com>", transport: { host: "127.0.0.1", port, secure: false } },
        () => {},
      );
      expect(direct.address).toBe(`127.0.0.1:${port}`);
      await direct.close();
    } finally {
      await t.close();
      await new Promise<void>((r) => server.close(() => r()));
    }
  });
});
