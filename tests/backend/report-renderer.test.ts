/**
 * Report files rendered on a thread of their own (backend/services/report-renderer.ts): the same
 * bytes as rendering in process, a failure answered with its message, a thread that dies
 * replaced at the next file.
 */
import ExcelJS from "exceljs";
import { afterAll, describe, expect, it } from "vitest";
import { buildReportContent } from "@backend/services/report-content";
import type { ReportMeta } from "@backend/services/report-pdf";
import { renderFile } from "@backend/services/report-render";
import { ReportRenderer } from "@backend/services/report-renderer";
import type { ReportContent } from "@shared/schemas/reports";
import type { Study } from "@shared/schemas/studies";
import { LARKFIELD, ownedStack, resultFor, STUDY } from "./report-fixtures";

const AT = "2026-01-05T10:00:00.000Z";
const stack = ownedStack();
const content = buildReportContent(
  {
    project: { id: "00000000-0000-4000-8000-000000000001", name: "Renderer" },
    revision: {
      id: "00000000-0000-4000-8000-000000000002",
      number: 1,
      status: "approved",
      stack,
      approvedAt: new Date(AT),
      approvedByName: "R",
    },
    study: {
      id: "00000000-0000-4000-8000-000000000003",
      number: 1,
      label: "",
      status: "finished",
      stack,
      study: STUDY,
      result: resultFor(stack),
      passes: true,
      site: null,
      finishedAt: AT,
    } as unknown as Study,
    supplier: { id: "00000000-0000-4000-8000-000000000004", name: LARKFIELD, kind: "assembly" },
    capability: { cpk: 1.33, overrides: {} },
  },
  new Date(AT),
);
const META: ReportMeta = {
  code: "TR-0007",
  revision: 1,
  status: "released",
  createdAt: AT,
  createdByName: "E",
  releasedAt: AT,
  releasedByName: "R",
  link: "http://localhost/reports/x",
  note: "",
  snapshot: null,
};

async function sheetValues(xlsx: Buffer) {
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.load(xlsx as unknown as ArrayBuffer);
  return wb.worksheets.map((ws) => ({ name: ws.name, values: JSON.stringify(ws.getSheetValues()) }));
}

const logs: string[] = [];
const renderer = new ReportRenderer((m) => logs.push(m));
afterAll(() => renderer.stop());

describe("report renderer thread", () => {
  it("gives the bytes the same file has when rendered in process", async () => {
    for (const kind of ["pdf", "csv"] as const) {
      const [there, here] = await Promise.all([renderer.render(content, META, kind), renderFile(content, META, kind)]);
      expect(there.length, kind).toBeGreaterThan(100);
      expect(there.equals(here), kind).toBe(true);
    }
    // a spreadsheet is a zip whose entries carry the time they were written (2 s steps), so two
    // renders straddling a step differ in those bytes: the sheets' cells are compared instead
    const [there, here] = await Promise.all([renderer.render(content, META, "xlsx"), renderFile(content, META, "xlsx")]);
    expect(await sheetValues(there)).toEqual(await sheetValues(here));
    expect((await sheetValues(there)).length).toBeGreaterThan(0);
  });

  it("answers a file that cannot be rendered with its message, and goes on rendering", async () => {
    const broken = { ...content, tolerances: null } as unknown as ReportContent;
    await expect(renderer.render(broken, META, "csv")).rejects.toThrow(/could not be rendered/);
    expect((await renderer.render(content, META, "csv")).equals(await renderFile(content, META, "csv"))).toBe(true);
  });

  it("fails the files a dying thread owed, and starts a new one for the next", async () => {
    const owed = renderer.render(content, META, "pdf");
    await renderer.threadForTest()!.terminate();
    await expect(owed).rejects.toThrow(/stopped/);
    expect(logs.some((l) => l.includes("starts a new one"))).toBe(true);
    expect((await renderer.render(content, META, "csv")).equals(await renderFile(content, META, "csv"))).toBe(true);
  });

  it("refuses files once stopped", async () => {
    const stopped = new ReportRenderer();
    await stopped.stop();
    await expect(stopped.render(content, META, "csv")).rejects.toThrow(/stopped/);
  });
});
