import { cleanup, render, screen, within } from "@testing-library/react";
import { createMemoryRouter, RouterProvider } from "react-router";
import { afterEach, describe, expect, it } from "vitest";
import type { Role } from "@shared/schemas/common";
import { SideNav, type NavCounts } from "@frontend/app/shell/side-nav";

afterEach(cleanup);

function labels(role: Role, counts?: NavCounts): string[] {
  const router = createMemoryRouter([{ path: "*", element: <SideNav role={role} counts={counts} /> }], { initialEntries: ["/projects"] });
  render(<RouterProvider router={router} />);
  const nav = screen.getByRole("navigation", { name: "Main" });
  return within(nav)
    .getAllByRole("link")
    .map((a) => a.getAttribute("href") ?? "");
}

describe("SideNav", () => {
  it.each<[Role, string[]]>([
    ["admin", ["/", "/projects", "/reports", "/suppliers", "/members", "/outbox", "/status"]],
    ["engineer", ["/", "/projects", "/reports", "/suppliers"]],
    ["reviewer", ["/", "/projects", "/reports", "/suppliers"]],
    ["supplier", ["/reports"]],
  ])("shows %s the screens of that role", (role, expected) => {
    expect(labels(role)).toEqual(expected);
  });

  it("marks the current screen (and not Home, which is only `/` itself)", () => {
    labels("admin");
    const current = screen.getAllByRole("link", { current: "page" });
    expect(current.map((a) => a.getAttribute("href"))).toEqual(["/projects"]);
  });

  it("shows beside Home how much waits, in words for a screen reader, and nothing at zero", () => {
    labels("reviewer", { "/": 3 });
    const home = screen.getByRole("link", { name: /Home/ });
    expect(home.textContent).toBe("Home3 waiting for you");
    expect(within(home).getByTestId("nav-count-home").getAttribute("title")).toBe("3 waiting for you");
    cleanup();
    labels("reviewer", { "/": 0 });
    expect(screen.queryByTestId("nav-count-home")).toBeNull();
  });
});
