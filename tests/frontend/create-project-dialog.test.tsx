import { cleanup, fireEvent, screen, waitFor } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { CreateProjectDialog } from "@frontend/features/projects/components/project-form-dialog";
import { jsonResponse, mockFetch, renderWithApp } from "./helpers";

const PROJECT = {
  id: "0b6f2c1e-8a55-4d7e-9a51-3f0c6f1d2e77",
  name: "Ridgeline watch module, rev C",
  description: "",
  ownerId: "u1",
  ownerName: "Ezra Lindqvist",
  createdAt: "2026-01-05T10:00:00.000Z",
  updatedAt: "2026-01-05T10:00:00.000Z",
  archivedAt: null,
  version: 1,
  lastStudy: null,
};

afterEach(() => {
  cleanup();
  vi.restoreAllMocks();
});

function open() {
  return renderWithApp(<CreateProjectDialog open onClose={() => {}} />, {
    path: "/projects",
    extraRoutes: [{ path: "/projects/:id", element: <p>project page</p> }],
  });
}

const nameInput = () => screen.getByLabelText("Project name") as HTMLInputElement;
const submit = () => fireEvent.click(screen.getByRole("button", { name: "Create project" }));

describe("CreateProjectDialog", () => {
  it("shows the shared schema's message under the name and sends nothing when the name is blank", async () => {
    const fetchSpy = mockFetch(() => jsonResponse(201, PROJECT));
    open();
    fireEvent.change(nameInput(), { target: { value: "   " } });
    submit();

    const message = await screen.findByText("Project name must not be empty");
    // The message is tied to the input for screen readers.
    expect(nameInput().getAttribute("aria-invalid")).toBe("true");
    expect(nameInput().getAttribute("aria-describedby")).toContain(message.id);
    expect(fetchSpy).not.toHaveBeenCalled();
  });

  it("puts the server's field errors next to their fields", async () => {
    mockFetch(() =>
      jsonResponse(400, {
        error: {
          code: "invalid_input",
          message: "The request body is not valid.",
          fields: [{ path: "name", message: "A project with this name already exists" }],
        },
      }),
    );
    open();
    fireEvent.change(nameInput(), { target: { value: "Ridgeline watch module, rev C" } });
    submit();

    expect(await screen.findByText("A project with this name already exists")).toBeTruthy();
    expect(nameInput().getAttribute("aria-invalid")).toBe("true");
    // The dialog stays open with what was typed.
    expect(nameInput().value).toBe("Ridgeline watch module, rev C");
  });

  it("shows an error without fields (e.g. 403) at the top of the form", async () => {
    mockFetch(() => jsonResponse(403, { error: { code: "forbidden", message: "Your role may not create projects." } }));
    open();
    fireEvent.change(nameInput(), { target: { value: "Rev D" } });
    submit();
    const alert = await screen.findByText("Your role may not create projects.");
    expect(alert.closest('[role="alert"]')).not.toBeNull();
  });

  it("sends the trimmed values and opens the new project", async () => {
    const fetchSpy = mockFetch(({ url, method }) =>
      url === "/api/projects" && method === "POST"
        ? jsonResponse(201, PROJECT)
        : jsonResponse(404, { error: { code: "not_found", message: "x" } }),
    );
    const { router } = open();
    fireEvent.change(nameInput(), { target: { value: "  Ridgeline watch module, rev C  " } });
    fireEvent.change(screen.getByLabelText(/Description/), { target: { value: " Heading budget ±2° " } });
    submit();

    await waitFor(() => expect(router.state.location.pathname).toBe(`/projects/${PROJECT.id}`));
    const [, init] = fetchSpy.mock.calls[0];
    expect(JSON.parse(String(init?.body))).toEqual({ name: "Ridgeline watch module, rev C", description: "Heading budget ±2°" });
  });
});
