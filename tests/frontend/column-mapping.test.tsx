import { cleanup, fireEvent, screen, waitFor, within } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import stack from "../../backend/demo/ridgeline-stack.json";
import { ColumnMapping } from "@frontend/features/datasets/components/column-mapping";
import type { Dataset } from "@shared/schemas/datasets";
import { jsonResponse, mockFetch, renderWithApp } from "./helpers";

afterEach(() => {
  cleanup();
  vi.restoreAllMocks();
});

const PROJECT = "0b6f2c1e-8a55-4d7e-9a51-3f0c6f1d2e77";
const REV = "9ee0e65a-0fc1-47e8-97d7-7dccbb3f8cd8";
const summary = {
  id: REV,
  projectId: PROJECT,
  number: 1,
  status: "approved" as const,
  name: "Ridgeline 9-axis module",
  note: "Baseline",
  basedOnId: null,
  version: 1,
  createdByName: "Ezra Lindqvist",
  approvedByName: "Rana Haddad",
  createdAt: "2026-01-05T10:00:00.000Z",
  updatedAt: "2026-01-05T10:00:00.000Z",
  submittedAt: null,
  approvedAt: null,
};
const revision = { ...summary, stack, requirements: [], comments: [], warnings: [] };
const column = (key: string, kind: "number" | "label", letter: string) => ({
  key,
  name: key,
  letter,
  unit: kind === "number" ? ("um" as const) : null,
  kind,
  summary: null,
  mapping: null,
});
const DATASET: Dataset = {
  id: "22222222-2222-4222-8222-222222222222",
  projectId: PROJECT,
  name: "mag-corners.csv",
  fileType: "csv",
  sheet: null,
  sizeBytes: 900,
  rows: 30,
  columnCount: 2,
  mappedColumns: [],
  uploadedByName: "Ezra Lindqvist",
  uploadedByRole: "engineer",
  supplierName: null,
  report: null,
  lot: "L2611-12",
  note: null,
  lotColumn: null,
  version: 3,
  createdAt: "2026-01-05T10:00:00.000Z",
  columns: [column("lot", "label", "A"), column("h0", "number", "B")],
  pooled: [],
  preview: { rowNumbers: [], cells: [] },
  sha256: "0".repeat(64),
};

describe("the column mapping", () => {
  it("waits for the lot column to be saved before it saves the mapping, so the second change is not stale", async () => {
    let lotSaved: (r: Response) => void = () => undefined;
    const patches: { url: string; version: string | null }[] = [];
    mockFetch(({ url, method, headers }) => {
      if (url === `/api/projects/${PROJECT}/revisions`) return jsonResponse(200, { revisions: [summary] });
      if (url === `/api/revisions/${REV}`) return jsonResponse(200, revision);
      if (method === "PATCH") {
        patches.push({ url, version: headers.get("if-match") });
        return new Promise<Response>((resolve) => (lotSaved = resolve));
      }
      return jsonResponse(404, { error: { code: "not_found", message: url } });
    });
    renderWithApp(<ColumnMapping dataset={DATASET} canWrite onShow={() => undefined} />);

    const mapping = await screen.findByRole("table", { name: "Column mapping" });
    const source = within(mapping).getByLabelText("Tolerance source for h0 [µm]");
    await waitFor(() => expect(within(source).getAllByRole("option").length).toBeGreaterThan(1));
    fireEvent.change(source, { target: { value: "mag.bondLine" } });
    const save = screen.getByRole<HTMLButtonElement>("button", { name: "Save mapping" });
    expect(save.disabled).toBe(false);

    // the lot column goes out first; until its answer is in, the mapping cannot be saved
    fireEvent.change(screen.getByLabelText("Lot column"), { target: { value: "lot" } });
    await waitFor(() => expect(save.disabled).toBe(true));
    fireEvent.click(save);
    expect(patches.map((p) => p.url)).toEqual([`/api/datasets/${DATASET.id}`]);

    lotSaved(jsonResponse(200, { ...DATASET, lotColumn: "lot", version: 4 }));
    await waitFor(() => expect(save.disabled).toBe(false));
  });
});
