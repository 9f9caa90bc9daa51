import { describe, expect, it } from "vitest";
import { navLabels, openProjects, screenshot, signIn, signInAs } from "./support/browser";
import { setupE2E, unexpectedProblems } from "./support/setup";

const e2e = setupE2E();

const DEMO = [
  {
    email: "admin@example.com",
    role: "Admin",
    start: "/",
    nav: ["Home", "Projects", "Reports", "Suppliers", "Members", "Outbox", "Server status"],
  },
  { email: "engineer@example.com", role: "Engineer", start: "/", nav: ["Home", "Projects", "Reports", "Suppliers"] },
  { email: "reviewer@example.com", role: "Reviewer", start: "/", nav: ["Home", "Projects", "Reports", "Suppliers"] },
  { email: "supplier@example.com", role: "Supplier", start: "/reports", nav: ["Reports"] },
] as const;

describe("signing in as each demo user", () => {
  for (const user of DEMO) {
    it(`${user.email} sees the ${user.role.toLowerCase()} navigation`, async () => {
      const { page, problems } = await e2e.session();
      await signIn(page, user.email);
      await page.waitForURL((url) => url.pathname === user.start);
      await page.getByRole("navigation", { name: "Main" }).waitFor();
      expect(await navLabels(page)).toEqual(user.nav);
      const topBar = page.getByRole("banner");
      await expect(topBar.getByText(user.role, { exact: true }).isVisible()).resolves.toBe(true);
      await expect(page.getByTestId("workspace-name").innerText()).resolves.toBe("Kestrel Wearables");

      if (user.role === "Supplier") {
        await page.getByRole("heading", { name: "Reports" }).waitFor();
        await page.getByText("No reports released to you yet").waitFor();
        // The projects screen is not theirs, even by typing the address.
        await page.goto("/projects");
        await page.getByRole("heading", { name: "Not available for your role" }).waitFor();
      } else {
        // staff start on what waits for them
        await page.getByRole("heading", { name: "Waiting for you" }).waitFor();
        await openProjects(page);
        const canWrite = user.role !== "Reviewer";
        await expect(page.getByRole("button", { name: "New project" }).count()).resolves.toBe(canWrite ? 1 : 0);
        await page.getByRole("link", { name: "Suppliers" }).click();
        await page.getByRole("heading", { name: "Suppliers" }).waitFor();
        await page.getByRole("article", { name: "Larkfield Assembly" }).waitFor();
        await expect(page.getByRole("button", { name: "Add company" }).count()).resolves.toBe(user.role === "Admin" ? 1 : 0);
        await page.getByRole("link", { name: "Projects" }).click();
        await page.getByRole("table", { name: "Projects" }).waitFor();
      }
      if (user.role !== "Admin") {
        await page.goto("/members");
        await page.getByRole("heading", { name: "Not available for your role" }).waitFor();
        await page.goto(user.start);
        await page.getByRole("navigation", { name: "Main" }).waitFor();
      }
      await screenshot(page, `start-${user.role.toLowerCase()}`);
      expect(unexpectedProblems(problems)).toEqual([]);
    });
  }
});

describe("signing out", () => {
  it("returns to the sign-in page and the app stays closed", async () => {
    const { page, problems } = await e2e.session();
    await signInAs(page, "engineer@example.com");
    await page.getByRole("button", { name: "Sign out" }).click();
    await page.waitForURL((url) => url.pathname === "/sign-in");
    await page.getByRole("heading", { name: "Sign in" }).waitFor();
    await screenshot(page, "sign-in");

    // The session is gone on the server too: the app sends us back to sign in.
    await page.goto("/projects");
    await page.waitForURL((url) => url.pathname === "/sign-in");
    expect(new URL(page.url()).searchParams.get("next")).toBe("/projects");
    const me = await page.request.get("/api/me");
    expect(me.status()).toBe(401);
    expect(unexpectedProblems(problems)).toEqual([]);
  });

  it("after signing in again, `next` brings the person back where they were going", async () => {
    const { page } = await e2e.session();
    await page.goto("/suppliers");
    await page.waitForURL((url) => url.pathname === "/sign-in");
    // The demo hint fills the form in.
    await page.getByRole("button", { name: /reviewer@example\.com/ }).click();
    await expect(page.getByLabel("E-mail address").inputValue()).resolves.toBe("reviewer@example.com");
    await page.getByRole("button", { name: "Sign in", exact: true }).click();
    await page.waitForURL((url) => url.pathname === "/suppliers");
    await page.getByRole("heading", { name: "Suppliers" }).waitFor();
  });
});

describe("a wrong password", () => {
  it("shows a clear message and stays on the sign-in page", async () => {
    const { page, problems } = await e2e.session();
    await signIn(page, "engineer@example.com", "not-the-password");
    await page.getByText("That e-mail address and password do not match an account.").waitFor();
    expect(new URL(page.url()).pathname).toBe("/sign-in");
    await screenshot(page, "sign-in-wrong-password");
    expect(unexpectedProblems(problems)).toEqual([]);
  });
});
