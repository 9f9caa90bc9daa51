/**
 * The editor's review card shows a revision in review with what changed since the one before
 * (issue 11: "a reviewer sees the change set before approving"), not only once Approve is
 * pressed; a draft and a first revision ask for no diff there.
 */
import { cleanup, screen, within } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import reference from "../fixtures/stack-reference.json" with { type: "json" };
import type { StackFile } from "@shared/schemas/stack-file";
import type { Revision } from "@shared/schemas/revisions";
import { ReviewNotes } from "@frontend/features/stack-editor/components/review-panel";
import { jsonResponse, mockFetch, renderWithApp } from "./helpers";

afterEach(() => {
  cleanup();
  vi.restoreAllMocks();
});

const ID = "11111111-1111-4111-8111-111111111111";
const BASE = "33333333-3333-4333-8333-333333333333";
const revision: Revision = {
  id: ID,
  projectId: "22222222-2222-4222-8222-222222222222",
  number: 2,
  status: "in_review",
  version: 4,
  name: "Module",
  note: "Thinner film under the mag.",
  basedOnId: BASE,
  createdByName: "Eng",
  approvedByName: null,
  createdAt: "2026-01-01T00:00:00.000Z",
  updatedAt: "2026-01-02T00:00:00.000Z",
  submittedAt: "2026-01-02T00:00:00.000Z",
  approvedAt: null,
  stack: structuredClone(reference) as unknown as StackFile,
  requirements: [],
  comments: [],
  warnings: [],
};

function serve() {
  const asked: string[] = [];
  mockFetch(({ url }) => {
    asked.push(url);
    if (url === `/api/revisions/${ID}/diff`)
      return jsonResponse(200, {
        against: { id: BASE, number: 1 },
        changes: [
          { path: "a", label: "mag: bond-line thickness", kind: "changed", before: 10, after: 15, unit: "µm" },
          { path: "b", label: "shim: element", kind: "added", before: null, after: "shim (spacer on pkg)", unit: null },
        ],
      });
    return jsonResponse(404, { error: { code: "not_found", message: url } });
  });
  return asked;
}

describe("ReviewNotes", () => {
  it("shows a revision in review with its change set against the revision before", async () => {
    serve();
    renderWithApp(<ReviewNotes revision={revision} />);
    const changes = await screen.findByRole("region", { name: "What changed" });
    await within(changes).findByText("mag: bond-line thickness");
    expect(changes.textContent).toContain("What changed since revision 1: 2 changes");
    expect(changes.textContent).toContain("10 µm → 15 µm");
    expect(changes.textContent).toContain("shim (spacer on pkg)");
  });

  it("asks for no diff on a draft or on a project's first revision", async () => {
    const asked = serve();
    const { unmount } = renderWithApp(<ReviewNotes revision={{ ...revision, status: "draft" }} />);
    await screen.findByText("No notes yet.");
    unmount();
    renderWithApp(<ReviewNotes revision={{ ...revision, number: 1, basedOnId: null }} />);
    await screen.findByText("No notes yet.");
    expect(screen.queryByRole("region", { name: "What changed" })).toBeNull();
    expect(asked.filter((u) => u.endsWith("/diff"))).toEqual([]);
  });
});
