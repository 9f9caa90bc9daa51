import { describe, expect, it, vi, afterEach } from "vitest";
import { cleanup, fireEvent, screen, waitFor, within } from "@testing-library/react";
import { uploadDataset } from "@frontend/features/datasets/api/upload-dataset";
import { DatasetsPanel } from "@frontend/features/datasets/components/datasets-panel";
import { ReportMeasurements } from "@frontend/features/datasets/components/report-measurements";
import { jsonResponse, renderWithApp } from "./helpers";
import { niceTicks } from "@frontend/features/datasets/lib/ticks";
import { formatMeasure, formatMeasureUnit, formatPpm } from "@shared/format";

const PROJECT = "11111111-1111-4111-8111-111111111111";
const DATASET = {
  id: "22222222-2222-4222-8222-222222222222",
  projectId: PROJECT,
  name: "first-build.csv",
  fileType: "csv",
  sheet: null,
  sizeBytes: 900,
  rows: 48,
  columnCount: 3,
  mappedColumns: [{ column: "yaw [mrad]", source: "mag.yaw" }],
  uploadedByName: "Sam Whitcombe",
  uploadedByRole: "supplier",
  supplierName: "Larkfield Assembly",
  report: { id: "33333333-3333-4333-8333-333333333333", number: 7, revision: 2 },
  lot: null,
  note: null,
  lotColumn: null,
  version: 1,
  createdAt: new Date().toISOString(),
};

afterEach(() => {
  cleanup();
  vi.restoreAllMocks();
});

describe("data set formatting", () => {
  it("four significant digits, a true minus, units after the number", () => {
    expect(formatMeasure(0.056006)).toBe("0.05601");
    expect(formatMeasure(-1.3)).toBe("−1.3");
    expect(formatMeasure(12345.6)).toBe("12346");
    expect(formatMeasure(2.5e-7)).toBe("2.500e-7");
    expect(formatMeasureUnit(0.4, "deg")).toBe("0.4°");
    expect(formatMeasureUnit(10.38, "um")).toBe("10.38 µm");
    expect(formatPpm(2699.8)).toBe("2,700 ppm");
    expect(formatPpm(0.573)).toBe("0.57 ppm");
  });

  it("round axis ticks that include zero exactly", () => {
    expect(niceTicks(-0.432, 0.432, 8)).toEqual([-0.4, -0.3, -0.2, -0.1, 0, 0.1, 0.2, 0.3, 0.4]);
    expect(niceTicks(0, 27, 5)).toEqual([0, 5, 10, 15, 20, 25]);
  });
});

describe("upload", () => {
  it("sends the file as multipart form data, not JSON", async () => {
    const spy = vi.spyOn(globalThis, "fetch").mockResolvedValue(jsonResponse(400, { error: { code: "invalid_file", message: "no" } }));
    const file = new File(["v [um]\n1\n"], "m.csv", { type: "text/csv" });
    await expect(uploadDataset({ projectId: PROJECT, file })).rejects.toMatchObject({ status: 400, code: "invalid_file" });
    const [path, init] = spy.mock.calls[0] as [string, RequestInit];
    expect(path).toBe(`/api/projects/${PROJECT}/datasets`);
    expect(init.method).toBe("POST");
    expect(init.body).toBeInstanceOf(FormData);
    expect((init.body as FormData).get("file")).toBeInstanceOf(File);
    expect(init.headers).not.toHaveProperty("Content-Type");
  });
});

describe("the data sets panel", () => {
  it("lists who sent each data set, through which report, and shows a refused file's rows and columns", async () => {
    vi.spyOn(globalThis, "fetch").mockImplementation(async (input, init) => {
      const url = String(input);
      if (url.endsWith("/datasets") && (init?.method ?? "GET") === "GET") return jsonResponse(200, { datasets: [DATASET] });
      return jsonResponse(400, {
        error: {
          code: "invalid_file",
          message: "Row 3, column B (tilt [deg]): “abc” is not a number. (2 problems; nothing was stored)",
          fields: [
            { path: "Row 3, column B (tilt [deg])", message: "“abc” is not a number" },
            { path: "Row 5, column B (tilt [deg])", message: "missing value" },
          ],
        },
      });
    });
    const { container } = renderWithApp(<DatasetsPanel projectId={PROJECT} canWrite />);
    const table = await screen.findByRole("table", { name: "Data sets" });
    const row = within(table).getByRole("row", { name: /first-build\.csv/ });
    expect(within(row).getByText("Sam Whitcombe")).toBeTruthy();
    expect(within(row).getByText("Larkfield Assembly")).toBeTruthy();
    expect(within(row).getByText("TR-0007 rev 2")).toBeTruthy();
    expect(within(row).getByText("mag.yaw")).toBeTruthy();

    const input = container.querySelector('input[type="file"]') as HTMLInputElement;
    fireEvent.change(input, { target: { files: [new File(["x"], "bad.csv", { type: "text/csv" })] } });
    await waitFor(() => expect(screen.getByText(/“abc” is not a number\. \(2 problems/)).toBeTruthy());
    const problems = screen.getByRole("list", { name: "Problems in the file" });
    expect(
      within(problems)
        .getAllByRole("listitem")
        .map((li) => li.textContent),
    ).toEqual(["Row 3, column B (tilt [deg]): “abc” is not a number", "Row 5, column B (tilt [deg]): missing value"]);
  });

  it("a reader gets no upload button", async () => {
    vi.spyOn(globalThis, "fetch").mockResolvedValue(jsonResponse(200, { datasets: [] }));
    renderWithApp(<DatasetsPanel projectId={PROJECT} canWrite={false} />);
    await screen.findByText("No measurements yet");
    expect(screen.queryByRole("button", { name: "Upload measurements" })).toBeNull();
  });
});

describe("measurements sent for a report", () => {
  const REPORT = DATASET.report.id;

  it("sends the lot and the note with the file, and lists the uploads by lot with their notes", async () => {
    const sent: FormData[] = [];
    const uploads = [
      { ...DATASET, id: "44444444-4444-4444-8444-444444444441", name: "lot-a-1.csv", lot: "A-17", note: "first 40 units" },
      { ...DATASET, id: "44444444-4444-4444-8444-444444444442", name: "loose.csv" },
      { ...DATASET, id: "44444444-4444-4444-8444-444444444443", name: "lot-a-2.csv", lot: "A-17", note: null },
    ];
    vi.spyOn(globalThis, "fetch").mockImplementation(async (input, init) => {
      if ((init?.method ?? "GET") === "POST") {
        sent.push(init!.body as FormData);
        return jsonResponse(201, { ...DATASET, name: "lot-b.csv", lot: "B-02", note: "after rework" });
      }
      return jsonResponse(200, { datasets: uploads });
    });
    const { container } = renderWithApp(<ReportMeasurements reportId={REPORT} canSend />);

    const lotA = await screen.findByRole("list", { name: "Measurements sent for this report, Lot A-17" });
    expect(
      within(lotA)
        .getAllByRole("listitem")
        .map((li) => li.querySelector("span")?.textContent),
    ).toEqual(["lot-a-1.csv", "lot-a-2.csv"]);
    expect(within(lotA).getByText("first 40 units")).toBeTruthy();
    const none = screen.getByRole("list", { name: "Measurements sent for this report, No lot given" });
    expect(within(none).getByText("loose.csv")).toBeTruthy();

    fireEvent.change(screen.getByLabelText("Lot of the measured units"), { target: { value: " B-02 " } });
    fireEvent.change(screen.getByLabelText("Note for the engineer"), { target: { value: "after rework" } });
    const file = container.querySelector('input[type="file"]') as HTMLInputElement;
    fireEvent.change(file, { target: { files: [new File(["v [um]\n1\n"], "lot-b.csv", { type: "text/csv" })] } });
    await waitFor(() => expect(sent).toHaveLength(1));
    expect(sent[0].get("lot")).toBe("B-02");
    expect(sent[0].get("note")).toBe("after rework");
    expect(sent[0].get("file")).toBeInstanceOf(File);
  });
});
