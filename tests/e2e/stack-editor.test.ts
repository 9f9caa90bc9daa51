import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { screenshot, signInAs } from "./support/browser";
import { setupE2E, unexpectedProblems } from "./support/setup";

const e2e = setupE2E();

const headingP99 = (page: Page) => page.getByTestId("estimate-heading-p99");
const estimateStatus = (page: Page) => page.getByTestId("estimate-status");
const saveStatus = (page: Page) => page.getByTestId("save-status");

/** Waits until the live estimate has settled (not waiting, not running) and returns its heading p99 text. */
async function settledHeading(page: Page, timeout = 30_000): Promise<string> {
  await page.waitForFunction(
    () => {
      const s = document.querySelector('[data-testid="estimate-status"]')?.textContent ?? "";
      return /^Updated in/.test(s.trim());
    },
    undefined,
    { timeout },
  );
  return (await headingP99(page).textContent())?.trim() ?? "";
}

async function waitSaved(page: Page) {
  await page.waitForFunction(() => /^Saved · \d\d:\d\d$/.test(document.querySelector('[data-testid="save-status"]')?.textContent?.trim() ?? ""), undefined, {
    timeout: 20_000,
  });
}

async function openDemoRevision(page: Page, number: number) {
  await page.getByRole("link", { name: /Ridgeline/ }).first().click();
  await page.getByRole("table", { name: "Stack revisions" }).waitFor();
  await page.getByRole("link", { name: `Open revision ${number}` }).click();
  await page.getByRole("tree", { name: "Elements" }).waitFor();
}

describe("the stack editor", () => {
  it("edits a tolerance of the demo draft: the estimate follows, undo restores it, the draft saves itself", async () => {
    const { page, problems } = await e2e.session();
    await signInAs(page, "engineer@example.com");
    await page.getByRole("link", { name: /Ridgeline/ }).first().click();
    await page.getByRole("table", { name: "Stack revisions" }).waitFor();
    await screenshot(page, "editor-project-revisions");
    await page.getByRole("link", { name: "Open revision 2" }).click();
    await page.getByRole("tree", { name: "Elements" }).waitFor();

    await expect(page.getByText("Estimate · 3,000 trials").count()).resolves.toBe(1);
    const before = await settledHeading(page, 60_000);
    expect(before).toMatch(/^\d+\.\d+$/);
    await screenshot(page, "editor-demo-draft");

    // The magnetometer's bond line, in the table of every source: 2 um -> 12 um.
    const magBond = page.getByLabel("mag.bondLine tolerance");
    await expect(magBond.inputValue()).resolves.toBe("2");
    await magBond.fill("12");
    const t0 = Date.now();
    await page.waitForFunction((b) => {
      const s = document.querySelector('[data-testid="estimate-status"]')?.textContent?.trim() ?? "";
      const v = document.querySelector('[data-testid="estimate-heading-p99"]')?.textContent?.trim();
      return /^Updated in/.test(s) && v !== b;
    }, before, { timeout: 30_000 });
    const after = await settledHeading(page);
    const took = Date.now() - t0;
    expect(Number(after)).toBeGreaterThan(Number(before));
    // The form of the selected element shows the same value.
    await page.getByRole("treeitem", { name: /^mag,/ }).click();
    await expect(page.getByRole("group", { name: "Height of each support tolerance" }).getByLabel("± Tolerance").inputValue()).resolves.toBe("12");
    await waitSaved(page);
    await screenshot(page, "editor-demo-changed");

    // Undo (Ctrl+Z) restores the value and the figures.
    await page.keyboard.press("Control+z");
    await expect(magBond.inputValue()).resolves.toBe("2");
    await page.waitForFunction((b) => document.querySelector('[data-testid="estimate-heading-p99"]')?.textContent?.trim() === b, before, { timeout: 30_000 });
    // Redo (the button) brings the change back; it is saved.
    await page.getByRole("button", { name: "Redo" }).click();
    await expect(magBond.inputValue()).resolves.toBe("12");
    await page.waitForFunction((a) => document.querySelector('[data-testid="estimate-heading-p99"]')?.textContent?.trim() === a, after, { timeout: 30_000 });
    await waitSaved(page);

    // The server has it: a reload shows the change.
    await page.reload();
    await page.getByRole("tree", { name: "Elements" }).waitFor();
    await expect(page.getByLabel("mag.bondLine tolerance").inputValue()).resolves.toBe("12");
    const stored = await page.evaluate(async () => {
      const path = location.pathname.split("/");
      const r = await fetch(`/api/revisions/${path[path.length - 1]}`);
      return (await r.json()).stack.elements.find((e: { id: string }) => e.id === "mag").bondLine.heightTol.tol;
    });
    expect(stored).toBe(12);
    console.info(`live estimate after an edit: ${took} ms (heading p99 ${before}° -> ${after}°)`);
    expect(unexpectedProblems(problems)).toEqual([]);
  });
});
