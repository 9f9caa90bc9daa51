import { cleanup, render, screen, within } from "@testing-library/react";
import { createMemoryRouter, RouterProvider } from "react-router";
import { afterEach, describe, expect, it } from "vitest";
import type { Role } from "@shared/schemas/common";
import { SideNav } from "@frontend/app/shell/side-nav";

afterEach(cleanup);

function labels(role: Role): string[] {
  const router = createMemoryRouter([{ path: "*", element: <SideNav role={role} /> }], { initialEntries: ["/projects"] });
  render(<RouterProvider router={router} />);
  const nav = screen.getByRole("navigation", { name: "Main" });
  return within(nav)
    .getAllByRole("link")
    .map((a) => a.getAttribute("href") ?? "");
}

describe("SideNav", () => {
  it.each<[Role, string[]]>([
    ["admin", ["/projects", "/reports", "/suppliers", "/members", "/outbox", "/status"]],
    ["engineer", ["/projects", "/reports", "/suppliers"]],
    ["reviewer", ["/projects", "/reports", "/suppliers"]],
    ["supplier", ["/reports"]],
  ])("shows %s the screens of that role", (role, expected) => {
    expect(labels(role)).toEqual(expected);
  });

  it("marks the current screen", () => {
    labels("admin");
    const current = screen.getByRole("link", { current: "page" });
    expect(current.getAttribute("href")).toBe("/projects");
  });
});
