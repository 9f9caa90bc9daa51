/**
 * Records kept (issue 11 item 4) as the screens offer it: the delete dialog explains the 409 for
 * a project holding approved or released records and offers to archive it instead; an admin types
 * the project's name; the project list archives, restores and counts what waits for review.
 */
import { cleanup, fireEvent, screen, waitFor, within } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import type { Project } from "@shared/schemas/api";
import { DeleteProjectDialog } from "@frontend/features/projects/components/delete-project-dialog";
import { ProjectsTable } from "@frontend/features/projects/components/projects-table";
import { jsonResponse, mockFetch, renderWithApp } from "./helpers";

const PROJECT: Project = {
  id: "0b6f2c1e-8a55-4d7e-9a51-3f0c6f1d2e77",
  name: "Ridgeline watch module, rev C",
  description: "",
  ownerId: "u1",
  ownerName: "Ezra Lindqvist",
  createdAt: "2026-01-05T10:00:00.000Z",
  updatedAt: "2026-01-05T10:00:00.000Z",
  archivedAt: null,
  version: 4,
  lastStudy: null,
};
const OTHER: Project = { ...PROJECT, id: "6a1d9c53-2b4e-4f0a-8e77-0c2d4b1a9f10", name: "Harbour tag, rev A", version: 2 };
const ARCHIVED: Project = {
  ...PROJECT,
  id: "9d0e5f7a-3c21-4b8e-a6d4-5e2f1c0b7a33",
  name: "Kite band, rev B",
  archivedAt: "2026-02-01T09:00:00.000Z",
  version: 7,
};

afterEach(() => {
  cleanup();
  vi.restoreAllMocks();
});

const KEPT = {
  error: {
    code: "records_kept",
    message:
      "“Ridgeline watch module, rev C” holds 1 approved revision, which are kept. Archive the project instead; only an admin can delete it.",
  },
};
const NEEDS_NAME = {
  error: {
    code: "confirmation_required",
    message: "“Ridgeline watch module, rev C” holds 1 released report. To delete them with it, confirm with the project's name.",
  },
};

type Call = { url: string; method: string; headers: Headers };

function server(onDelete: (url: string) => Response) {
  const calls: Call[] = [];
  mockFetch(({ url, method, headers }) => {
    calls.push({ url, method, headers });
    if (method === "DELETE") return onDelete(url);
    if (method === "POST" && url.endsWith("/archive"))
      return jsonResponse(200, { ...PROJECT, archivedAt: "2026-03-01T08:00:00.000Z", version: 5 });
    if (method === "POST" && url.endsWith("/restore")) return jsonResponse(200, { ...ARCHIVED, archivedAt: null, version: 8 });
    return jsonResponse(404, { error: { code: "not_found", message: "no" } });
  });
  return calls;
}

function openDelete(project = PROJECT) {
  const onClose = vi.fn();
  const onDeleted = vi.fn();
  renderWithApp(<DeleteProjectDialog project={project} open onClose={onClose} onDeleted={onDeleted} />);
  return { onClose, onDeleted };
}

describe("DeleteProjectDialog", () => {
  it("deletes a project that keeps nothing, without asking for its name", async () => {
    const calls = server(() => new Response(null, { status: 204 }));
    const { onDeleted } = openDelete();
    fireEvent.click(screen.getByRole("button", { name: "Delete project" }));
    await waitFor(() => expect(onDeleted).toHaveBeenCalled(), { timeout: 5000 });
    expect(calls.map((c) => `${c.method} ${c.url}`)).toEqual([`DELETE /api/projects/${PROJECT.id}`]);
    // on the version the page read, so a project someone else changed meanwhile is not deleted unseen
    expect(calls[0].headers.get("if-match")).toBe('"4"');
  });

  it("says so when someone else changed the project meanwhile, and keeps the dialog open", { timeout: 20_000 }, async () => {
    const calls = server(() =>
      jsonResponse(409, {
        error: {
          code: "conflict",
          message: `The project “${PROJECT.name}” was changed by someone else since you loaded it (it is now at version 5). Load it again and reapply your change.`,
          version: 5,
        },
      }),
    );
    const { onClose, onDeleted } = openDelete();
    fireEvent.click(screen.getByRole("button", { name: "Delete project" }));
    const dialog = await screen.findByRole("dialog", { name: "Delete this project?" });
    expect((await within(dialog).findByText(/changed by someone else/)).textContent).toContain("version 5");
    expect(onDeleted).not.toHaveBeenCalled();
    expect(onClose).not.toHaveBeenCalled();
    expect(calls.filter((c) => c.method === "DELETE")).toHaveLength(1);
  });

  it("explains the 409 of kept records to an engineer and archives instead, on the version read", { timeout: 20_000 }, async () => {
    const calls = server(() => jsonResponse(409, KEPT));
    const { onClose, onDeleted } = openDelete();
    fireEvent.click(screen.getByRole("button", { name: "Delete project" }));

    const dialog = await screen.findByRole("dialog", { name: "This project keeps records" });
    expect(within(dialog).getByText(/holds 1 approved revision/)).toBeTruthy();
    expect(within(dialog).getByText(/never deleted by accident/)).toBeTruthy();
    expect(within(dialog).getByText(/read-only/)).toBeTruthy();
    // no second try at deleting from here
    expect(within(dialog).queryByRole("button", { name: /Delete/ })).toBeNull();

    fireEvent.click(within(dialog).getByRole("button", { name: "Archive instead" }));
    await waitFor(() => expect(onClose).toHaveBeenCalled(), { timeout: 5000 });
    const archive = calls.find((c) => c.method === "POST")!;
    expect(archive.url).toBe(`/api/projects/${PROJECT.id}/archive`);
    expect(archive.headers.get("if-match")).toContain("4");
    expect(onDeleted).not.toHaveBeenCalled();
  });

  it("asks an admin for the project's exact name and sends it as confirm", { timeout: 20_000 }, async () => {
    const calls = server((url) => (url.includes("confirm=") ? new Response(null, { status: 204 }) : jsonResponse(409, NEEDS_NAME)));
    const { onDeleted } = openDelete();
    fireEvent.click(screen.getByRole("button", { name: "Delete project" }));

    const name = await screen.findByLabelText("Type the project's name to confirm");
    expect(screen.getByText(/holds 1 released report/)).toBeTruthy();
    const confirm = screen.getByRole("button", { name: "Delete with its records" }) as HTMLButtonElement;
    expect(screen.getByRole("button", { name: "Archive instead" })).toBeTruthy();
    fireEvent.change(name, { target: { value: "Ridgeline watch module" } });
    expect(confirm.disabled).toBe(true);
    fireEvent.change(name, { target: { value: PROJECT.name } });
    expect(confirm.disabled).toBe(false);
    fireEvent.click(confirm);

    await waitFor(() => expect(onDeleted).toHaveBeenCalled(), { timeout: 5000 });
    expect(calls.at(-1)!.url).toBe(`/api/projects/${PROJECT.id}?confirm=${encodeURIComponent(PROJECT.name).replace(/%20/g, "+")}`);
  });

  it("offers no archiving for a project archived already", async () => {
    server(() => jsonResponse(409, KEPT));
    openDelete(ARCHIVED);
    fireEvent.click(screen.getByRole("button", { name: "Delete project" }));
    const dialog = await screen.findByRole("dialog", { name: "This project keeps records" });
    expect(within(dialog).getByText(/archived already/)).toBeTruthy();
    expect(within(dialog).queryByRole("button", { name: "Archive instead" })).toBeNull();
  });
});

describe("ProjectsTable", () => {
  it("shows per project what awaits review, and a dash where nothing does", () => {
    renderWithApp(
      <ProjectsTable
        projects={[PROJECT, OTHER]}
        canWrite={false}
        awaiting={{ [PROJECT.id]: { projectId: PROJECT.id, revisions: 2, reports: 1 } }}
      />,
    );
    const rows = screen.getAllByRole("row").slice(1);
    expect(within(rows[0]).getByText("2 revisions, 1 report")).toBeTruthy();
    expect(within(rows[1]).queryByText(/revision|report/)).toBeNull();
    // a reviewer changes nothing here
    expect(screen.queryByRole("button", { name: /Archive|Delete|Restore/ })).toBeNull();
  });

  it("offers archive on an open project, restore on an archived one, and marks the archived one", { timeout: 20_000 }, async () => {
    const calls = server(() => new Response(null, { status: 204 }));
    renderWithApp(<ProjectsTable projects={[PROJECT, ARCHIVED]} canWrite />);
    expect(screen.getByRole("button", { name: `Archive ${PROJECT.name}` })).toBeTruthy();
    expect(screen.queryByRole("button", { name: `Rename ${ARCHIVED.name}` })).toBeNull();
    expect(screen.queryByRole("button", { name: `Archive ${ARCHIVED.name}` })).toBeNull();
    expect(within(screen.getAllByRole("row")[2]).getByText(/Archived/)).toBeTruthy();

    fireEvent.click(screen.getByRole("button", { name: `Restore ${ARCHIVED.name}` }));
    await waitFor(() => expect(calls.some((c) => c.method === "POST")).toBe(true), { timeout: 5000 });
    const restore = calls.find((c) => c.method === "POST")!;
    expect(restore.url).toBe(`/api/projects/${ARCHIVED.id}/restore`);
    expect(restore.headers.get("if-match")).toContain("7");

    fireEvent.click(screen.getByRole("button", { name: `Archive ${PROJECT.name}` }));
    const dialog = await screen.findByRole("dialog", { name: "Archive this project?" });
    fireEvent.click(within(dialog).getByRole("button", { name: "Archive project" }));
    await waitFor(() => expect(calls.some((c) => c.url.endsWith(`${PROJECT.id}/archive`))).toBe(true), { timeout: 5000 });
  });
});
