/** The project's revisions list shows each later revision's change set on request (issue 11). */
import { cleanup, fireEvent, screen, within } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import type { RevisionSummary } from "@shared/schemas/revisions";
import { RevisionsPanel } from "@frontend/features/revisions/components/revisions-panel";
import { jsonResponse, mockFetch, renderWithApp } from "./helpers";

afterEach(() => {
  cleanup();
  vi.restoreAllMocks();
});

const PROJECT = "22222222-2222-4222-8222-222222222222";
const summary = (n: number, id: string): RevisionSummary => ({
  id,
  projectId: PROJECT,
  number: n,
  status: n === 1 ? "approved" : "draft",
  version: 1,
  name: "Module",
  note: n === 1 ? "" : "Thinner film.",
  basedOnId: null,
  createdByName: "Eng",
  approvedByName: n === 1 ? "Rev" : null,
  createdAt: "2026-01-01T00:00:00.000Z",
  updatedAt: "2026-01-02T00:00:00.000Z",
  submittedAt: null,
  approvedAt: n === 1 ? "2026-01-02T00:00:00.000Z" : null,
});
const FIRST = "11111111-1111-4111-8111-111111111111";
const SECOND = "33333333-3333-4333-8333-333333333333";

describe("RevisionsPanel", () => {
  it("opens and closes the change set of a later revision; the first has none to show", async () => {
    const asked: string[] = [];
    mockFetch(({ url }) => {
      asked.push(url);
      if (url === `/api/projects/${PROJECT}/revisions`) return jsonResponse(200, { revisions: [summary(2, SECOND), summary(1, FIRST)] });
      if (url === `/api/revisions/${SECOND}/diff`)
        return jsonResponse(200, {
          against: { id: FIRST, number: 1 },
          changes: [{ path: "p", label: "mag: bond-line thickness", kind: "changed", before: 10, after: 15, unit: "µm" }],
        });
      return jsonResponse(404, { error: { code: "not_found", message: url } });
    });
    renderWithApp(<RevisionsPanel projectId={PROJECT} projectName="Module" canWrite={false} />);
    const table = await screen.findByRole("table", { name: "Stack revisions" });
    const toggles = within(table).getAllByRole("button", { name: /^What changed/ });
    expect(toggles).toHaveLength(1);
    expect(toggles[0].textContent).toBe("What changed in revision 2");
    // nothing asked until it is opened
    expect(asked.filter((u) => u.includes("/diff"))).toEqual([]);
    fireEvent.click(toggles[0]);
    const changes = await within(table).findByRole("region", { name: "What changed" });
    await within(changes).findByText("mag: bond-line thickness");
    expect(changes.textContent).toContain("10 µm → 15 µm");
    expect(toggles[0].getAttribute("aria-expanded")).toBe("true");
    fireEvent.click(within(table).getByRole("button", { name: /^Hide changes/ }));
    expect(within(table).queryByRole("region", { name: "What changed" })).toBeNull();
  }, 30_000);

  it("says a draft started from another revision has no note yet, and shows the note once written", async () => {
    const THIRD = "44444444-4444-4444-8444-444444444444";
    const fresh = { ...summary(3, THIRD), note: "", basedOnId: FIRST };
    mockFetch(({ url }) =>
      url === `/api/projects/${PROJECT}/revisions`
        ? jsonResponse(200, { revisions: [fresh, { ...summary(2, SECOND), basedOnId: FIRST }, summary(1, FIRST)] })
        : jsonResponse(404, { error: { code: "not_found", message: url } }),
    );
    renderWithApp(<RevisionsPanel projectId={PROJECT} projectName="Module" canWrite={false} />);
    const table = await screen.findByRole("table", { name: "Stack revisions" });
    const rows = within(table).getAllByRole("row");
    expect(rows[1].textContent).toContain("From revision 1; no note yet on what changed and why.");
    expect(rows[2].textContent).toContain("Thinner film.");
    expect(rows[2].textContent).not.toContain("no note yet");
    expect(rows[3].textContent).not.toContain("no note yet");
  }, 30_000);
});
