/**
 * Building a report from a study that misses a target (issue 11 item 3): the dialog says which
 * targets, with the yield predicted and the yield asked, before the engineer builds; a study
 * that meets them says nothing of the kind.
 */
import { cleanup, fireEvent, screen, waitFor, within } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import type { ReportOptions } from "@shared/schemas/reports";
import { BuildReportDialog } from "@frontend/features/reports/components/build-report-dialog";
import { jsonResponse, mockFetch, renderWithApp } from "./helpers";

afterEach(() => {
  cleanup();
  vi.restoreAllMocks();
});

const PROJECT = "22222222-2222-4222-8222-222222222222";
const supplier = {
  supplierId: "55555555-5555-4555-8555-555555555555",
  name: "Larkfield Assembly",
  kind: "assembly",
  sources: ["mag.bondLine", "mag.yaw"],
  contacts: 1,
  latest: null,
};
const study = (n: number, id: string, missed: ReportOptions["studies"][number]["missed"]): ReportOptions["studies"][number] => ({
  id,
  number: n,
  label: "",
  status: "finished",
  revisionId: "66666666-6666-4666-8666-666666666666",
  revisionNumber: 1,
  revisionStatus: "approved",
  finishedAt: "2026-01-02T00:00:00.000Z",
  passes: missed.length === 0,
  missed,
  blockedBy: null,
  suppliers: [supplier],
  unmatchedOwners: [],
  unowned: [],
});
const MISSING = "33333333-3333-4333-8333-333333333333";
const MEETING = "44444444-4444-4444-8444-444444444444";

describe("BuildReportDialog", () => {
  it("names each target the chosen study misses, and nothing for a study that meets them all", async () => {
    mockFetch(({ url }) =>
      url === `/api/projects/${PROJECT}/report-options`
        ? jsonResponse(200, {
            studies: [
              study(3, MISSING, [
                { metric: "heading.maxAbsDeg", label: "Heading error, max over the sweep", yield: 0.99, predictedYield: 0.9512 },
              ]),
              study(2, MEETING, []),
            ],
          } satisfies ReportOptions)
        : jsonResponse(404, { error: { code: "not_found", message: url } }),
    );
    renderWithApp(<BuildReportDialog projectId={PROJECT} open onClose={() => undefined} onBuilt={() => undefined} />);
    const dialog = await screen.findByRole("dialog", { name: "Build a supplier report" });
    const alert = await within(dialog).findByText("Study 3 misses a target");
    const box = alert.closest("[role=alert]")!;
    expect(box.textContent).toContain("Heading error, max over the sweep: 95.12 % predicted against 99.00 %");
    expect(box.textContent).toContain("its cover says so to the supplier");
    // it can still be built
    await waitFor(() => expect((within(dialog).getByRole("button", { name: "Build draft" }) as HTMLButtonElement).disabled).toBe(false));

    fireEvent.change(within(dialog).getByLabelText("Study"), { target: { value: MEETING } });
    expect(within(dialog).queryByText(/misses/)).toBeNull();
  }, 30_000);
});
