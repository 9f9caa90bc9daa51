/**
 * The draft's note edited outside submit (issue 11): sent with the version it was read at; a
 * stale version is refused by the server and the dialog says so, keeping what was typed.
 */
import { cleanup, fireEvent, screen, waitFor, within } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import reference from "../fixtures/stack-reference.json" with { type: "json" };
import type { StackFile } from "@shared/schemas/stack-file";
import type { Revision } from "@shared/schemas/revisions";
import { NoteDialog } from "@frontend/features/revisions";
import { jsonResponse, mockFetch, renderWithApp } from "./helpers";

afterEach(() => {
  cleanup();
  vi.restoreAllMocks();
});

const ID = "11111111-1111-4111-8111-111111111111";
const revision: Revision = {
  id: ID,
  projectId: "22222222-2222-4222-8222-222222222222",
  number: 3,
  status: "draft",
  version: 6,
  name: "Module",
  note: "Based on revision 2.",
  basedOnId: null,
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

describe("NoteDialog", () => {
  it("saves the note on the version it was read at, and shows the server's refusal of a stale one", async () => {
    const sent: { body: unknown; ifMatch: string | null }[] = [];
    let stale = false;
    mockFetch(({ url, method, body, headers }) => {
      if (url === `/api/revisions/${ID}` && method === "PATCH") {
        sent.push({ body, ifMatch: headers.get("if-match") });
        if (stale)
          return jsonResponse(409, {
            error: { code: "conflict", message: "Stack revision 3 was changed by someone else since you loaded it.", version: 7 },
          });
        return jsonResponse(200, { ...revision, version: 7, note: (body as { note: string }).note });
      }
      return jsonResponse(404, { error: { code: "not_found", message: url } });
    });
    const onSaved = vi.fn();
    renderWithApp(<NoteDialog revision={revision} version={6} onClose={() => undefined} onSaved={onSaved} />);
    const dialog = screen.getByRole("dialog", { name: "Note of revision 3" });
    const field = within(dialog).getByLabelText("What changed and why") as HTMLTextAreaElement;
    expect(field.value).toBe("Based on revision 2.");
    fireEvent.change(field, { target: { value: "  Film attach under the mag.  " } });
    fireEvent.click(within(dialog).getByRole("button", { name: "Save note" }));
    await waitFor(() => expect(onSaved).toHaveBeenCalledTimes(1));
    expect(onSaved.mock.calls[0][0]).toMatchObject({ version: 7, note: "Film attach under the mag." });
    expect(sent).toEqual([{ body: { note: "Film attach under the mag." }, ifMatch: '"6"' }]);

    stale = true;
    fireEvent.click(within(dialog).getByRole("button", { name: "Save note" }));
    await within(dialog).findByText(/was changed by someone else/);
    expect(onSaved).toHaveBeenCalledTimes(1);
    expect(field.value).toBe("  Film attach under the mag.  ");
  }, 30_000);
});
