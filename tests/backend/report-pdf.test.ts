/** The report files on their own (no server): names that wrap, nominals from a hand-made stack, rounding as stated. */
import { execFileSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { buildReportContent } from "@backend/services/report-content";
import { renderReportPdf, type ReportMeta } from "@backend/services/report-pdf";
import { renderReportCsv } from "@backend/services/report-sheets";
import { placeStack, drawingScale } from "@backend/services/report-pdf-drawing";
import { sourceNominal } from "@shared/reports/nominals";
import { measurementSteps } from "@shared/reports/measurement-plan";
import { formatFixed, roundTo } from "@shared/format";
import type { Study } from "@shared/schemas/studies";
import { LARKFIELD, ownedStack, resultFor, STUDY } from "./report-fixtures";

const tmp = mkdtempSync(join(tmpdir(), "orthostack-report-pdf-"));
afterAll(() => rmSync(tmp, { recursive: true, force: true }));
const pdfText = (pdf: Buffer) => {
  const path = join(tmp, `r${Math.random().toString(36).slice(2)}.pdf`);
  writeFileSync(path, pdf);
  return execFileSync("pdftotext", ["-layout", path, "-"], { encoding: "utf8" });
};

const LONG_SUPPLIER = "Larkfield Assembly and Test Services for Inertial Sensor Packages, Second Site";
const LONG_ID = "accelerometer_die_from_the_second_wafer_lot_of_the_year";

/** The reference stack with a long element id and name and a hand-made support list on the mag die. */
function handMade() {
  const stack = ownedStack();
  const accel = stack.elements.find((e) => e.id === "accel")!;
  accel.id = LONG_ID;
  accel.name = "accelerometer die from the second wafer lot, placed by the new bonder";
  stack.elements.find((e) => e.id === "mag")!.parent = LONG_ID;
  const mag = stack.elements.find((e) => e.id === "mag")!;
  mag.bondLine!.supports = [
    { x: -0.4, y: -0.2 },
    { x: 0.4, y: -0.2 },
    { x: 0, y: 0.22 },
  ];
  mag.placementTol!.xUm = { dist: "normal", tol: 25, owner: LARKFIELD };
  for (const e of stack.elements) for (const t of [e.bondLine?.heightTol, e.placementTol?.yawDeg]) if (t?.owner) t.owner = LONG_SUPPLIER;
  mag.placementTol!.xUm.owner = LONG_SUPPLIER;
  return stack;
}

function content() {
  const stack = handMade();
  const study = {
    ...STUDY,
    trials: 500,
    requirements: STUDY.requirements.map((r: { metric: string }) => ({ ...r, metric: r.metric.replace(/^accel~/, `${LONG_ID}~`) })),
  };
  return buildReportContent({
    project: { id: "00000000-0000-4000-8000-000000000001", name: "Heading module for the handheld survey instrument, second generation" },
    revision: {
      id: "00000000-0000-4000-8000-000000000002",
      number: 4,
      status: "approved",
      stack,
      approvedAt: new Date(),
      approvedByName: "R",
    },
    study: {
      id: "00000000-0000-4000-8000-000000000003",
      number: 2,
      label: "",
      status: "finished",
      stack,
      study,
      result: resultFor(stack, study),
      passes: false,
      site: null,
      finishedAt: new Date().toISOString(),
    } as unknown as Study,
    supplier: { id: "00000000-0000-4000-8000-000000000004", name: LONG_SUPPLIER, kind: "assembly" },
    capability: { cpk: 1.33, overrides: {} },
  });
}

const META: ReportMeta = {
  code: "TR-0042",
  revision: 1,
  status: "draft",
  createdAt: new Date().toISOString(),
  createdByName: "E",
  releasedAt: null,
  releasedByName: null,
  link: "http://localhost/reports/x",
  note: "",
  snapshot: null,
};

describe("report files from a hand-made stack", () => {
  const c = content();

  it("gives each source the nominal and datum of its stack field", () => {
    const nominal = (source: string) =>
      sourceNominal(
        c.tolerances.find((t) => t.source === source)!,
        c.stack,
      );
    expect(nominal("mag.bondLine")).toMatchObject({ nominal: 10, text: "10.0 µm" });
    // a support list given in the file is the datum, point by point
    expect(nominal("mag.bondLine").datum).toContain("3 points (−0.400, −0.200), (0.400, −0.200), (0.000, 0.220) mm");
    expect(nominal("mag.yaw")).toMatchObject({ nominal: 90, text: "90.000°" });
    // a placement offset sits on the position (mm), given in the tolerance's µm
    expect(nominal("mag.x")).toMatchObject({ nominal: 0, text: "0.000 mm" });
    expect(nominal("mag.x").datum).toContain(`centre of ${c.stack.find((e) => e.id === LONG_ID)!.name}'s top face`);
    const plan = measurementSteps(c).find((s) => s.tolerance.source === "mag.x")!;
    expect(plan.window).toBe("−25.0 – 25.0 µm");
    expect(measurementSteps(c).find((s) => s.tolerance.source === "mag.bondLine")!.readingsPerUnit).toBe(3);
  });

  it("places the stack from the board's top face: each bottom is its parent's top plus the bond line", () => {
    const placed = new Map(placeStack(c.stack).map((p) => [p.e.id, p]));
    const mag = placed.get("mag")!;
    const accel = placed.get(LONG_ID)!;
    expect(mag.z0).toBeCloseTo(accel.z1 + 0.01, 9);
    expect(placed.get("pkg")!.z0).toBeCloseTo(0.055, 9);
    // yaw of a parent turns its children's offsets: the mag (yaw 90°) sits on an unturned die here
    expect(mag.cx).toBeCloseTo(placed.get(LONG_ID)!.cx, 9);
    // a 3 mm package in 200 pt: 20:1 is 170 pt, 50:1 would be 425 pt
    expect(drawingScale(3, 200)).toBe(20);
  });

  it("wraps long names in the PDF instead of cutting them, and states the scale of each view", async () => {
    const text = pdfText(await renderReportPdf(c, META));
    const flat = text.replace(/\s+/g, " ");
    expect(text).not.toContain("…");
    expect(flat).toContain(LONG_SUPPLIER);
    expect(flat).toContain("accelerometer die from the second wafer lot, placed by the new bonder");
    // a long id breaks after an underscore at a line end, both pieces printed (columns beside it may sit between them)
    const joined = text.replace(/\s+/g, "");
    expect(joined).toContain("accelerometer_die_from_the");
    expect(joined).toContain("second_wafer_lot_of_the_year.bondLine");
    expect(flat).toMatch(/scale \d+:1 on A4 printed at 100 %/);
  });

  it("says on the cover which targets the study misses, and nothing of the kind when it meets them all", async () => {
    const missed = c.requirements.filter((r) => !r.passes);
    expect(missed.length).toBeGreaterThan(0);
    const cover = pdfText(await renderReportPdf(c, META))
      .split("\f")[0]
      .replace(/\s+/g, " ");
    expect(cover).toContain("TARGETS MISSED");
    expect(cover).toContain(`Study 2 misses ${missed.length} of ${c.requirements.length} targets:`);
    for (const r of missed) expect(cover).toContain(`R${c.requirements.indexOf(r) + 1} ${r.description}:`);
    expect(cover).toContain("ask before setting up production against these tolerances");

    const met = { ...c, requirements: c.requirements.map((r) => ({ ...r, passes: true })) };
    const clean = pdfText(await renderReportPdf(met, META)).replace(/\s+/g, " ");
    expect(clean).not.toContain("TARGETS MISSED");
    expect(clean).not.toContain("misses");
  });

  it("rounds the CSV's numbers to the resolution its headers state", () => {
    const csv = renderReportCsv(c, META).toString("utf8");
    const lines = csv.split("\r\n");
    const at = lines.indexOf("Tolerances deg");
    const head = lines[at + 1].match(/("[^"]*"|[^,]+)/g)!;
    expect(head).toContain('"Sigma max (deg, to 0.0001)"');
    const k = head.indexOf('"Sigma max (deg, to 0.0001)"');
    const row = lines[at + 2].match(/("[^"]*"|[^,]*)(,|$)/g)!.map((s) => s.replace(/,$/, ""));
    expect(row[k]).toMatch(/^\d+(\.\d{1,4})?$/);
    expect(formatFixed(-0.0004, 0.001)).toBe("0.000");
    expect(formatFixed(-0.3, 0.001)).toBe("−0.300");
    expect(roundTo(0.30000000000000004, 0.001)).toBe(0.3);
    expect(roundTo(-0.00001, 0.1)).toBe(0);
  });
});
