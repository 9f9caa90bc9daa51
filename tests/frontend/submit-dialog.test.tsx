/**
 * Submitting with eyes open (issue 11): the dialog shows what changed, asks for the note on a
 * later revision, lists the requirements that fail with their source, and submits only once
 * the engineer confirms, saying so to the server.
 */
import { cleanup, fireEvent, screen, waitFor, within } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import reference from "../fixtures/stack-reference.json" with { type: "json" };
import type { StackFile } from "@shared/schemas/stack-file";
import type { Revision, RevisionCheck } from "@shared/schemas/revisions";
import { SubmitDialog } from "@frontend/features/revisions";
import { jsonResponse, mockFetch, renderWithApp } from "./helpers";

afterEach(() => {
  cleanup();
  vi.restoreAllMocks();
});

const ID = "11111111-1111-4111-8111-111111111111";
const revision: Revision = {
  id: ID,
  projectId: "22222222-2222-4222-8222-222222222222",
  number: 2,
  status: "draft",
  version: 4,
  name: "Module",
  note: "",
  basedOnId: "33333333-3333-4333-8333-333333333333",
  createdByName: "Eng",
  approvedByName: null,
  createdAt: "2026-01-01T00:00:00.000Z",
  updatedAt: "2026-01-02T00:00:00.000Z",
  submittedAt: null,
  approvedAt: null,
  // a real stack: the client checks the answer against the revision schema
  stack: structuredClone(reference) as unknown as StackFile,
  requirements: [],
  comments: [],
  warnings: [],
};
const heading = {
  index: 0,
  metric: "heading.maxAbsDeg",
  label: "Heading error, max over the sweep",
  unit: "deg" as const,
  max: 2,
  target: 0.99,
  reached: 0.9703,
  passes: false,
  source: { kind: "estimate" as const, trials: 3000, inclinationDeg: 60 },
};
const tilt = { ...heading, index: 1, metric: "mag.tiltDeg", label: "mag tilt", max: 0.5, reached: 0.999, target: 0.99, passes: true };

function serve(check: RevisionCheck) {
  const submits: { body: unknown; ifMatch: string | null }[] = [];
  mockFetch(({ url, method, body, headers }) => {
    if (url === `/api/revisions/${ID}/requirement-check`) return jsonResponse(200, check);
    if (url === `/api/revisions/${ID}/diff`)
      return jsonResponse(200, {
        against: { id: revision.basedOnId, number: 1 },
        changes: [{ path: "x", label: "mag: bond-line height tolerance", kind: "changed", before: 2, after: 12, unit: "µm" }],
      });
    if (url === `/api/revisions/${ID}/submit` && method === "POST") {
      submits.push({ body, ifMatch: headers.get("if-match") });
      return jsonResponse(200, { ...revision, status: "in_review", version: 5, note: (body as { note?: string }).note ?? "" });
    }
    return jsonResponse(404, { error: { code: "not_found", message: `no ${url}` } });
  });
  return submits;
}

describe("SubmitDialog", () => {
  it("lists what fails, with the value reached, the target and the source, and submits only once confirmed", async () => {
    const submits = serve({ requirements: [heading, tilt], failing: [heading] });
    const onSubmitted = vi.fn();
    renderWithApp(<SubmitDialog open revision={revision} version={4} onClose={() => undefined} onSubmitted={onSubmitted} />);
    const dialog = await screen.findByRole("dialog", { name: "Submit revision 2 for review" });
    await within(dialog).findByText("mag: bond-line height tolerance");
    const failing = await within(dialog).findByRole("region", { name: "Requirements not met" });
    expect(failing.textContent).toContain("1 of 2 requirements is not met");
    expect(failing.textContent).toContain("Heading error, max over the sweep ≤ 2°");
    expect(failing.textContent).toMatch(
      /97\.03 % of units within the limit, 99\.00 % asked · live estimate, 3,000 trials at 60° inclination/,
    );
    expect(failing.textContent).not.toContain("mag tilt");

    const send = within(dialog).getByRole("button", { name: "Submit anyway" });
    expect((send as HTMLButtonElement).disabled).toBe(true);
    // a later revision needs its note
    fireEvent.click(within(dialog).getByRole("checkbox", { name: /I have seen what fails/ }));
    expect((send as HTMLButtonElement).disabled).toBe(false);
    fireEvent.click(send);
    await within(dialog).findByText(/a revision after the first needs a note/);
    expect(submits).toEqual([]);

    fireEvent.change(within(dialog).getByLabelText(/What changed and why/), { target: { value: "Thinner film under the mag." } });
    fireEvent.click(send);
    await waitFor(() => expect(onSubmitted).toHaveBeenCalledTimes(1));
    expect(submits).toEqual([{ body: { note: "Thinner film under the mag.", confirmFailing: true }, ifMatch: '"4"' }]);
  }, 30_000);

  it("says the requirements are met and their source, and submits without a confirmation", async () => {
    const study = { ...tilt, index: 0, source: { kind: "study" as const, studyId: ID, number: 7 } };
    const submits = serve({ requirements: [study], failing: [] });
    renderWithApp(
      <SubmitDialog open revision={{ ...revision, note: "Film." }} version={4} onClose={() => undefined} onSubmitted={() => undefined} />,
    );
    const dialog = await screen.findByRole("dialog");
    await within(dialog).findByText("Its requirement is met (study 7).");
    expect(within(dialog).queryByRole("checkbox")).toBeNull();
    fireEvent.click(within(dialog).getByRole("button", { name: "Submit for review" }));
    await waitFor(() => expect(submits).toHaveLength(1));
    expect(submits[0].body).toEqual({ note: "Film." });
  }, 30_000);
});
