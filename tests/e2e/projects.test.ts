import { describe, expect, it } from "vitest";
import { screenshot, signInAs } from "./support/browser";
import { setupE2E, unexpectedProblems } from "./support/setup";

const e2e = setupE2E();

describe("an engineer's projects", () => {
  it("creates a project, renames it, finds it by search and deletes it", async () => {
    const { page, problems } = await e2e.session();
    await signInAs(page, "engineer@example.com");

    // The dialog is the browser's modal one: focus starts in the form, Tab never reaches the page
    // behind it (past the last control it may go to the browser's own controls, as the document
    // then has none), Escape closes it and focus returns to the button that opened it.
    const newProject = page.getByRole("button", { name: "New project" });
    await newProject.click();
    const dialog = page.getByRole("dialog", { name: "New project" });
    await expect.poll(() => dialog.getByLabel("Project name").evaluate((el) => el === document.activeElement)).toBe(true);
    for (let i = 0; i < 8; i++) {
      await page.keyboard.press("Tab");
      const at = await dialog.evaluate((el) =>
        el.contains(document.activeElement) ? "dialog" : (document.activeElement?.tagName ?? "none"),
      );
      expect(["dialog", "BODY", "none"]).toContain(at);
    }
    await page.keyboard.press("Escape");
    await dialog.waitFor({ state: "detached" });
    expect(await newProject.evaluate((el) => el === document.activeElement)).toBe(true);

    // Create: an empty name is refused in the form, before any request.
    await newProject.click();
    await dialog.getByRole("button", { name: "Create project" }).click();
    await dialog.getByText("Project name must not be empty").waitFor();
    await screenshot(page, "project-create-error");

    await dialog.getByLabel("Project name").fill("Harbour tracker IMU, rev A");
    await dialog.getByLabel(/Description/).fill("Accelerometer and gyroscope on the tracker ASIC; heading budget ±3° at 95 % of units.");
    await dialog.getByRole("button", { name: "Create project" }).click();

    // The new project's page opens, with its creation on record.
    await page.waitForURL(/\/projects\/[0-9a-f-]{36}$/);
    await page.getByRole("heading", { name: "Harbour tracker IMU, rev A", level: 1 }).waitFor();
    await page
      .getByRole("list", { name: "Project activity" })
      .getByText(/created the project/)
      .waitFor();
    await screenshot(page, "project-page");

    // Rename from the project page.
    await page.getByRole("button", { name: "Rename" }).click();
    const rename = page.getByRole("dialog", { name: "Rename project" });
    await rename.getByLabel("Project name").fill("Harbour tracker IMU, rev B");
    await rename.getByRole("button", { name: "Save changes" }).click();
    await page.getByRole("heading", { name: "Harbour tracker IMU, rev B", level: 1 }).waitFor();
    await rename.waitFor({ state: "detached" });

    // Search keeps its term in the address.
    await page.getByRole("link", { name: "Projects" }).first().click();
    const table = page.getByRole("table", { name: "Projects" });
    await table.getByRole("link", { name: "Harbour tracker IMU, rev B" }).waitFor();
    await table.getByRole("link", { name: /Ridgeline/ }).waitFor();
    await page.getByRole("searchbox", { name: "Search projects" }).fill("harbour");
    await page.waitForURL((url) => url.searchParams.get("q") === "harbour");
    // The table keeps the earlier rows while the new search runs; wait for it to settle.
    await table.getByRole("link", { name: /Ridgeline/ }).waitFor({ state: "detached" });
    await table.getByRole("link", { name: "Harbour tracker IMU, rev B" }).waitFor();
    await screenshot(page, "projects-search");

    // The address alone reproduces the search (a shared link, a reload).
    await page.reload();
    await expect(page.getByRole("searchbox", { name: "Search projects" }).inputValue()).resolves.toBe("harbour");
    await table.getByRole("link", { name: "Harbour tracker IMU, rev B" }).waitFor();
    await expect(table.getByRole("row").count()).resolves.toBe(2); // header + one project

    // Rename from the table, too.
    await page.getByRole("button", { name: "Rename Harbour tracker IMU, rev B" }).click();
    const inline = page.getByRole("dialog", { name: "Rename project" });
    await inline.getByLabel("Project name").fill("Harbour tracker IMU, rev C");
    await inline.getByRole("button", { name: "Save changes" }).click();
    // Still matches "harbour", so it stays in the filtered list under its new name.
    await table.getByRole("link", { name: "Harbour tracker IMU, rev C" }).waitFor();

    // Delete asks first; cancelling keeps it.
    await page.getByRole("button", { name: "Delete Harbour tracker IMU, rev C" }).click();
    const confirm = page.getByRole("dialog", { name: "Delete this project?" });
    await confirm.getByText("This cannot be undone.").waitFor();
    await screenshot(page, "project-delete-confirm");
    await confirm.getByRole("button", { name: "Cancel" }).click();
    await table.getByRole("link", { name: "Harbour tracker IMU, rev C" }).waitFor();

    await page.getByRole("button", { name: "Delete Harbour tracker IMU, rev C" }).click();
    await page.getByRole("dialog", { name: "Delete this project?" }).getByRole("button", { name: "Delete project" }).click();
    await page.getByText("No project matches “harbour”").waitFor();

    const list = await page.request.get("/api/projects?q=harbour");
    expect((await list.json()).projects).toEqual([]);
    expect(unexpectedProblems(problems)).toEqual([]);
  });

  it("keeps a project with an approved revision: delete offers to archive instead; archived, it is read-only and restores", async () => {
    const { page, problems } = await e2e.session();
    await signInAs(page, "engineer@example.com");
    const table = page.getByRole("table", { name: "Projects" });
    const ridgeline = (
      await table
        .getByRole("link", { name: /Ridgeline/ })
        .first()
        .innerText()
    ).trim();

    await page.getByRole("button", { name: `Delete ${ridgeline}` }).click();
    await page.getByRole("dialog", { name: "Delete this project?" }).getByRole("button", { name: "Delete project" }).click();
    const kept = page.getByRole("dialog", { name: "This project keeps records" });
    await kept.getByText(/1 approved revision/).waitFor();
    await screenshot(page, "project-delete-kept");
    await kept.getByRole("button", { name: "Archive instead" }).click();
    await kept.waitFor({ state: "detached" });
    await table.getByRole("link", { name: ridgeline }).waitFor({ state: "detached" });

    // the filter shows it, marked, and its page offers no change
    await page.getByRole("combobox", { name: "Show" }).selectOption("only");
    await page.waitForURL((url) => url.searchParams.get("archived") === "only");
    await table.getByRole("link", { name: ridgeline }).click();
    await page
      .getByText(/read-only/)
      .first()
      .waitFor();
    await expect(page.getByRole("button", { name: "Rename" }).count()).resolves.toBe(0);
    await page.getByRole("link", { name: "Open revision 2" }).waitFor(); // still readable
    await expect(page.getByRole("button", { name: "Edit", exact: true }).count()).resolves.toBe(0);
    await expect(page.getByRole("button", { name: "Start a draft from revision 1" }).count()).resolves.toBe(0);
    await screenshot(page, "project-archived");
    // the draft opens read-only, with nothing to submit
    await page.getByRole("link", { name: "Open revision 2" }).click();
    await page.getByText(/is archived: read only/).waitFor();
    await expect(page.getByRole("button", { name: /Submit/ }).count()).resolves.toBe(0);
    await page.goBack();
    await page.getByRole("heading", { name: ridgeline, level: 1 }).waitFor();

    await page.getByRole("button", { name: "Restore" }).click();
    await page.getByRole("button", { name: "Rename" }).waitFor();
    await page
      .getByRole("list", { name: "Project activity" })
      .getByText(/restored the project/)
      .waitFor();
    const open = await page.request.get("/api/projects");
    expect(((await open.json()).projects as Array<{ name: string }>).map((p) => p.name)).toContain(ridgeline);
    expect(unexpectedProblems(problems)).toEqual([]);
  });

  it("shows a friendly page for a project that does not exist", async () => {
    const { page, problems } = await e2e.session();
    await signInAs(page, "engineer@example.com");
    await page.goto("/projects/5b0f0c1e-0000-4000-8000-000000000000");
    await page.getByRole("heading", { name: "Not found" }).waitFor();
    // The shell stays, so the person can carry on.
    await page.getByRole("navigation", { name: "Main" }).waitFor();
    await page.goto("/no-such-page");
    await page.getByRole("heading", { name: "Page not found" }).waitFor();
    await screenshot(page, "not-found");
    expect(unexpectedProblems(problems)).toEqual([]);
  });

  it("lets a reviewer read a project but offers no way to change it", async () => {
    const { page } = await e2e.session();
    await signInAs(page, "reviewer@example.com");
    await page.getByRole("link", { name: /Ridgeline/ }).click();
    await page.getByRole("heading", { name: /Ridgeline/, level: 1 }).waitFor();
    await page.getByRole("heading", { name: "Activity" }).waitFor();
    await expect(page.getByRole("button", { name: "Rename" }).count()).resolves.toBe(0);
    await expect(page.getByRole("button", { name: "Delete" }).count()).resolves.toBe(0);
    await screenshot(page, "project-page-reviewer");
  });
});
