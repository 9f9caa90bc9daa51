import { QueryClientProvider } from "@tanstack/react-query";
import { cleanup, fireEvent, render, screen, waitFor } from "@testing-library/react";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import type { StackFile } from "@shared/schemas/stack-file";
import reference from "../fixtures/stack-reference.json" with { type: "json" };
import { useAutosave } from "@frontend/features/stack-editor/hooks/use-autosave";
import { readBackup } from "@frontend/features/stack-editor/lib/backup";
import type { EditorDoc } from "@frontend/features/stack-editor/lib/stack-ops";
import { createQueryClient } from "@frontend/lib/query-client";
import { jsonResponse, mockFetch } from "./helpers";

vi.setConfig({ testTimeout: 20_000 });
afterEach(() => {
  cleanup();
  vi.restoreAllMocks();
  localStorage.clear();
});
beforeEach(() => localStorage.clear());

const REV_ID = "6a0b3c1e-8a55-4d7e-9a51-3f0c6f1d2e70";
const PROJECT_ID = "0b6f2c1e-8a55-4d7e-9a51-3f0c6f1d2e77";
const saved: EditorDoc = { stack: reference as unknown as StackFile, requirements: [] };

function revisionBody(doc: EditorDoc, version = 4) {
  return {
    id: REV_ID,
    projectId: PROJECT_ID,
    number: 2,
    status: "draft",
    version,
    name: doc.stack.name ?? "",
    note: "",
    basedOnId: null,
    createdByName: "Ezra Lindqvist",
    approvedByName: null,
    createdAt: "2026-01-05T10:00:00.000Z",
    updatedAt: "2026-01-05T10:05:00.000Z",
    submittedAt: null,
    approvedAt: null,
    stack: doc.stack,
    requirements: doc.requirements,
    comments: [],
    warnings: [],
  };
}

/** The draft as loaded was at version 3. */
function Probe({ doc, problems, theirs }: { doc: EditorDoc; problems: number; theirs?: { doc: EditorDoc; version: number } }) {
  const a = useAutosave({
    revisionId: REV_ID,
    doc,
    savedDoc: saved,
    enabled: true,
    problems,
    updatedAt: "2026-01-05T10:00:00.000Z",
    version: 3,
  });
  return (
    <>
      <p data-testid="probe" data-kind={a.state.kind} data-dirty={String(a.dirty)} data-saves={a.saves} data-version={a.version()}>
        {a.state.kind === "error" || a.state.kind === "conflict" ? a.state.message : a.state.kind}
      </p>
      {theirs ? (
        <button type="button" onClick={() => a.rebase(theirs.doc, theirs.version)}>
          rebase
        </button>
      ) : null}
    </>
  );
}

function mount(doc: EditorDoc, problems = 0, theirs?: { doc: EditorDoc; version: number }) {
  const client = createQueryClient();
  const ui = (d: EditorDoc, p: number) => (
    <QueryClientProvider client={client}>
      <Probe doc={d} problems={p} theirs={theirs} />
    </QueryClientProvider>
  );
  const r = render(ui(doc, problems));
  return { rerender: (d: EditorDoc, p = 0) => r.rerender(ui(d, p)) };
}

const probe = () => screen.getByTestId("probe");
const edited = (tol: number): EditorDoc => ({
  ...saved,
  stack: {
    ...saved.stack,
    elements: saved.stack.elements.map((e) =>
      e.id === "mag" ? { ...e, bondLine: { ...e.bondLine, heightTol: { dist: "normal", tol } } } : e,
    ),
  },
});

describe("autosave of a draft", () => {
  it("sends nothing while the document is the saved one", async () => {
    const spy = mockFetch(() => jsonResponse(200, revisionBody(saved)));
    mount(saved);
    await new Promise((r) => setTimeout(r, 1100));
    expect(spy).not.toHaveBeenCalled();
    expect(probe().dataset.kind).toBe("saved");
  });

  it("saves the stack and requirements after a pause, once", async () => {
    const calls: { method: string; url: string; body: unknown; ifMatch: string | null }[] = [];
    mockFetch((c) => {
      calls.push({ ...c, ifMatch: c.headers.get("if-match") });
      return jsonResponse(200, revisionBody(c.body as EditorDoc, 3 + calls.length));
    });
    const m = mount(saved);
    const doc = edited(7);
    m.rerender(doc);
    expect(probe().dataset.kind).toBe("pending");
    expect(probe().dataset.dirty).toBe("true");
    await waitFor(() => expect(probe().dataset.kind).toBe("saved"), { timeout: 5000 });
    expect(calls).toHaveLength(1);
    expect(calls[0]).toMatchObject({ method: "PATCH", url: `/api/revisions/${REV_ID}` });
    expect(calls[0].body).toEqual({ stack: doc.stack, requirements: doc.requirements });
    // made on the version loaded; the next save goes on from the version the server answered
    expect(calls[0].ifMatch).toBe('"3"');
    expect(probe().dataset.version).toBe("4");
    expect(probe().dataset.saves).toBe("1");
    expect(probe().dataset.dirty).toBe("false");
    expect(readBackup(REV_ID)).toBeNull();
    m.rerender(edited(8));
    await waitFor(() => expect(probe().dataset.saves).toBe("2"), { timeout: 5000 });
    expect(calls[1].ifMatch).toBe('"4"');
  });

  it("sends one save at a time on the version the last one answered, when edits go on during a slow save", async () => {
    // a server that takes longer than the autosave pause and checks the version like the real one
    let version = 3;
    const calls: { ifMatch: string | null; status: number }[] = [];
    mockFetch(async (c) => {
      await new Promise((r) => setTimeout(r, 1500));
      const sent = c.headers.get("if-match");
      if (sent !== `"${version}"`) {
        calls.push({ ifMatch: sent, status: 409 });
        return jsonResponse(409, { error: { code: "conflict", message: "changed by someone else", version } });
      }
      version += 1;
      calls.push({ ifMatch: sent, status: 200 });
      return jsonResponse(200, revisionBody(c.body as EditorDoc, version));
    });
    const m = mount(saved);
    m.rerender(edited(7));
    // the first save leaves after the pause and is still travelling when the next edits settle
    await waitFor(() => expect(probe().dataset.kind).toBe("saving"), { timeout: 3000 });
    m.rerender(edited(8));
    await new Promise((r) => setTimeout(r, 300));
    m.rerender(edited(9));
    await waitFor(() => expect(probe().dataset.kind).toBe("saved"), { timeout: 10_000 });
    await new Promise((r) => setTimeout(r, 2000));
    expect(calls.filter((c) => c.status === 409)).toEqual([]);
    expect(calls.map((c) => c.ifMatch)).toEqual(calls.map((_, i) => `"${3 + i}"`));
    expect(probe().dataset.kind).toBe("saved");
  });

  it("stops on a conflict, keeps the edits, and after a rebase saves them on the server's version", async () => {
    const calls: { ifMatch: string | null; body: unknown }[] = [];
    let answer: "conflict" | "ok" = "conflict";
    mockFetch((c) => {
      calls.push({ ifMatch: c.headers.get("if-match"), body: c.body });
      if (answer === "conflict") {
        return jsonResponse(409, {
          error: { code: "conflict", message: "Stack revision 2 was changed by someone else since you loaded it.", version: 5 },
        });
      }
      return jsonResponse(200, revisionBody(c.body as EditorDoc, 6));
    });
    const theirs = edited(4);
    const m = mount(saved, 0, { doc: theirs, version: 5 });
    const mine = edited(9);
    m.rerender(mine);
    await waitFor(() => expect(probe().dataset.kind).toBe("conflict"), { timeout: 5000 });
    expect(probe().textContent).toMatch(/changed by someone else/);
    expect(probe().dataset.dirty).toBe("true");
    expect(readBackup(REV_ID)?.doc).toEqual(mine);
    // more edits are kept but not sent, and the conflict stays on screen
    const more = edited(10);
    m.rerender(more);
    await new Promise((r) => setTimeout(r, 1100));
    expect(calls).toHaveLength(1);
    expect(probe().dataset.kind).toBe("conflict");

    answer = "ok";
    fireEvent.click(screen.getByRole("button", { name: "rebase" }));
    await waitFor(() => expect(probe().dataset.saves).toBe("1"), { timeout: 5000 });
    expect(calls).toHaveLength(2);
    expect(calls[1].ifMatch).toBe('"5"');
    expect(calls[1].body).toEqual({ stack: more.stack, requirements: more.requirements });
    expect(probe().dataset.version).toBe("6");
  });

  it("keeps a document with problems in this browser and does not send it", async () => {
    const spy = mockFetch(() => jsonResponse(200, {}));
    const m = mount(saved);
    const doc = edited(-1);
    m.rerender(doc, 1);
    expect(probe().dataset.kind).toBe("invalid");
    await new Promise((r) => setTimeout(r, 1100));
    expect(spy).not.toHaveBeenCalled();
    expect(readBackup(REV_ID)?.doc).toEqual(doc);
  });

  it("shows the server's refusal and keeps the edits in the browser copy", async () => {
    mockFetch(() =>
      jsonResponse(400, {
        error: {
          code: "invalid_stack",
          message: "The stack file has a problem; nothing was stored.",
          fields: [{ path: "stack.elements[5].size.x", message: "too small" }],
        },
      }),
    );
    const m = mount(saved);
    const doc = edited(9);
    m.rerender(doc);
    await waitFor(() => expect(probe().dataset.kind).toBe("error"), { timeout: 5000 });
    expect(probe().textContent).toBe("The stack file has a problem; nothing was stored.");
    expect(probe().dataset.dirty).toBe("true");
    expect(readBackup(REV_ID)?.doc).toEqual(doc);
  });
});
