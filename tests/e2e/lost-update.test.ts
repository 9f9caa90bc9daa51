/**
 * Issue 10, item 4, in the browser: two engineers edit one draft. The first one's save stands;
 * the second one's save is refused with the conflict in words, their edit stays on screen, and
 * "reload and reapply" puts it on top of the first one's: both edits are on the server.
 */
import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { openProjects, screenshot, signInAs } from "./support/browser";
import { setupE2E, unexpectedProblems } from "./support/setup";

const e2e = setupE2E();

const saveStatus = (page: Page) => page.getByTestId("save-status");

async function saves(page: Page): Promise<number> {
  return Number((await saveStatus(page).getAttribute("data-saves")) ?? -1);
}

/** Waits until the editor has saved more often than `after` times and nothing is pending. */
async function waitSaved(page: Page, after: number) {
  await page.waitForFunction(
    (n) => {
      const el = document.querySelector('[data-testid="save-status"]');
      return el?.getAttribute("data-state") === "saved" && Number(el.getAttribute("data-saves")) > n;
    },
    after,
    { timeout: 30_000 },
  );
}

async function openDemoDraft(page: Page) {
  await page
    .getByRole("link", { name: /Ridgeline/ })
    .first()
    .click();
  await page.getByRole("table", { name: "Stack revisions" }).waitFor();
  await page.getByRole("link", { name: "Open revision 2" }).click();
  await page.getByRole("tree", { name: "Elements" }).waitFor();
  await expect(saveStatus(page).textContent()).resolves.toMatch(/^Saved/);
}

/** The stored tolerance of a source, read from the server past the editor. */
async function storedTol(page: Page, element: string) {
  return page.evaluate(async (id) => {
    const path = location.pathname.split("/");
    const r = await fetch(`/api/revisions/${path[path.length - 1]}`);
    const rev = await r.json();
    return { version: rev.version as number, tol: rev.stack.elements.find((e: { id: string }) => e.id === id).bondLine.heightTol.tol };
  }, element);
}

describe("two engineers editing one draft", () => {
  it("the second save gets the conflict, reloads and reapplies its edit; nothing is lost", async () => {
    // a second engineer, invited by the admin
    const admin = await e2e.session();
    await signInAs(admin.page, "admin@example.com");
    const invitation = await admin.page.evaluate(async () => {
      const r = await fetch("/api/invitations", {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ email: "mira.solberg@example.com", role: "engineer" }),
      });
      return { status: r.status, body: await r.json() };
    });
    expect(invitation.status).toBe(201);
    const b = await e2e.session();
    await b.page.goto(invitation.body.link as string);
    await b.page.getByLabel("Your name").fill("Mira Solberg");
    await b.page.getByLabel("Choose a password").fill("gimbal-lock-2026");
    await b.page.getByRole("button", { name: /^Join / }).click();
    await b.page.waitForURL((url) => url.pathname === "/");
    await openProjects(b.page);

    const a = await e2e.session();
    await signInAs(a.page, "engineer@example.com");

    // both open the demo draft at the same version
    await openDemoDraft(a.page);
    await openDemoDraft(b.page);
    const before = await storedTol(a.page, "mag");

    // A changes the magnetometer's bond line and it saves
    await a.page.getByLabel("mag.bondLine tolerance").fill("12");
    await waitSaved(a.page, 0);
    expect(await storedTol(a.page, "mag")).toEqual({ version: before.version + 1, tol: 12 });

    // B, still on the version it loaded, changes the gyro's bond line: refused, in words
    const gyro = b.page.getByLabel("gyro.bondLine tolerance");
    await gyro.fill("7");
    const conflict = b.page.getByTestId("save-conflict");
    await conflict.waitFor({ timeout: 30_000 });
    await expect(conflict.textContent()).resolves.toMatch(/changed by someone else/);
    await b.page.getByText("Someone else saved this draft while you were editing it").waitFor();
    await expect(saveStatus(b.page).textContent()).resolves.toMatch(/Not saved: changed by someone else/);
    // B's edit is kept on screen, and the server still has A's
    await expect(gyro.inputValue()).resolves.toBe("7");
    expect(await storedTol(b.page, "mag")).toEqual({ version: before.version + 1, tol: 12 });
    await screenshot(b.page, "editor-save-conflict");

    // reload and reapply: A's change appears in B's editor with B's edit on top, and it saves
    const savedBefore = await saves(b.page);
    await b.page.getByRole("button", { name: "Reload and reapply my edits" }).click();
    await b.page.getByTestId("save-reapplied").waitFor();
    await expect(b.page.getByLabel("mag.bondLine tolerance").inputValue()).resolves.toBe("12");
    await expect(gyro.inputValue()).resolves.toBe("7");
    await waitSaved(b.page, savedBefore);
    await screenshot(b.page, "editor-save-reapplied");

    // nothing lost: both edits on the server
    const after = await storedTol(b.page, "gyro");
    expect(after).toEqual({ version: before.version + 2, tol: 7 });
    expect((await storedTol(b.page, "mag")).tol).toBe(12);

    // and A, now behind, is told the same way on its next edit instead of overwriting B's
    await a.page.getByLabel("mag.bondLine tolerance").fill("11");
    await a.page.getByTestId("save-conflict").waitFor({ timeout: 30_000 });
    expect((await storedTol(a.page, "gyro")).tol).toBe(7);

    expect(unexpectedProblems(a.problems)).toEqual([]);
    expect(unexpectedProblems(b.problems)).toEqual([]);
  });
});
