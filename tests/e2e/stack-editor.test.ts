import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { screenshot, signInAs } from "./support/browser";
import { submitConfirmingFailures } from "./support/review";
import { setupE2E, unexpectedProblems } from "./support/setup";

const e2e = setupE2E();

const headingP99 = (page: Page) => page.getByTestId("estimate-heading-p99");
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

/** The number of saves the editor has made in this visit. */
async function saves(page: Page): Promise<number> {
  return Number((await saveStatus(page).getAttribute("data-saves")) ?? -1);
}

/** Waits until the editor has saved more often than `after` times and nothing is pending. */
async function waitSaved(page: Page, after: number) {
  await page.waitForFunction(
    (n) => {
      const el = document.querySelector('[data-testid="save-status"]');
      return (
        el?.getAttribute("data-state") === "saved" &&
        Number(el.getAttribute("data-saves")) > n &&
        /^Saved · \d\d:\d\d$/.test(el.textContent?.trim() ?? "")
      );
    },
    after,
    { timeout: 20_000 },
  );
}

async function openDemoRevision(page: Page, number: number) {
  await page
    .getByRole("link", { name: /Ridgeline/ })
    .first()
    .click();
  await page.getByRole("table", { name: "Stack revisions" }).waitFor();
  await page.getByRole("link", { name: `Open revision ${number}` }).click();
  await page.getByRole("tree", { name: "Elements" }).waitFor();
}

describe("the stack editor", () => {
  it("edits a tolerance of the demo draft: the estimate follows, undo restores it, the draft saves itself", async () => {
    const { page, problems } = await e2e.session();
    await signInAs(page, "engineer@example.com");
    await page
      .getByRole("link", { name: /Ridgeline/ })
      .first()
      .click();
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
    await expect(saveStatus(page).textContent()).resolves.toMatch(/^Saved/);
    expect(await saves(page)).toBe(0);
    await magBond.fill("12");
    const t0 = Date.now();
    await page.waitForFunction(
      (b) => {
        const s = document.querySelector('[data-testid="estimate-status"]')?.textContent?.trim() ?? "";
        const v = document.querySelector('[data-testid="estimate-heading-p99"]')?.textContent?.trim();
        return /^Updated in/.test(s) && v !== b;
      },
      before,
      { timeout: 30_000 },
    );
    const after = await settledHeading(page);
    const took = Date.now() - t0;
    expect(Number(after)).toBeGreaterThan(Number(before));
    // The form of the selected element shows the same value.
    await page.getByRole("treeitem", { name: /^mag,/ }).click();
    await expect(
      page.getByRole("group", { name: "Height of each support tolerance" }).getByLabel("± Tolerance").inputValue(),
    ).resolves.toBe("12");
    await waitSaved(page, 0);
    await screenshot(page, "editor-demo-changed");
    const savedEdit = await saves(page);

    // Undo (Ctrl+Z) restores the value and the figures; the undone value is saved.
    await page.keyboard.press("Control+z");
    // the field shows the undone value once React has rendered it: asked until then, not read once
    await expect.poll(() => magBond.inputValue()).toBe("2");
    await page.waitForFunction((b) => document.querySelector('[data-testid="estimate-heading-p99"]')?.textContent?.trim() === b, before, {
      timeout: 30_000,
    });
    // waited for before the redo: a quick redo would otherwise fold both into one save of the
    // value already saved (on an idle machine the two clicks fall within the autosave's wait)
    await waitSaved(page, savedEdit);
    const savedUndo = await saves(page);
    // Redo (the button) brings the change back; it is saved.
    await page.getByRole("button", { name: "Redo" }).click();
    await expect.poll(() => magBond.inputValue()).toBe("12");
    await page.waitForFunction((a) => document.querySelector('[data-testid="estimate-heading-p99"]')?.textContent?.trim() === a, after, {
      timeout: 30_000,
    });
    await waitSaved(page, savedUndo);

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

    // Another element's form starts at its top, not where the last one was scrolled to (at
    // 1200 px the selected-element card has a height of its own and scrolls).
    await page.setViewportSize({ width: 1200, height: 800 });
    await page.getByRole("treeitem", { name: /^mag,/ }).click();
    const formBody = page.locator("section", { has: page.getByRole("heading", { name: "Selected element" }) }).locator(":scope > div");
    await formBody.evaluate((el) => el.scrollTo(0, el.scrollHeight));
    await expect.poll(() => formBody.evaluate((el) => el.scrollTop)).toBeGreaterThan(0);
    await page.getByRole("treeitem", { name: /^gyro,/ }).click();
    await page.getByRole("treeitem", { name: /^gyro,/, selected: true }).waitFor();
    await expect.poll(() => formBody.evaluate((el) => el.scrollTop)).toBe(0);
    await page.setViewportSize({ width: 1440, height: 900 });
    console.info(`live estimate after an edit: ${took} ms (heading p99 ${before}° -> ${after}°)`);
    expect(unexpectedProblems(problems)).toEqual([]);
  });

  it("builds a small stack from an empty project in the editor alone, with inline errors and a warning before leaving", async () => {
    const { page, problems } = await e2e.session();
    await signInAs(page, "engineer@example.com");
    await page.getByRole("button", { name: "New project" }).click();
    const dialog = page.getByRole("dialog", { name: "New project" });
    await dialog.getByLabel("Project name").fill("Harbour compass module, rev A");
    await dialog.getByRole("button", { name: "Create project" }).click();
    await page.getByRole("heading", { name: "Harbour compass module, rev A", level: 1 }).waitFor();
    await page.getByText("No stack yet").waitFor();
    await page.getByRole("button", { name: "New stack", exact: true }).click();

    // A board only; its size first.
    const tree = page.getByRole("tree", { name: "Elements" });
    await tree.waitFor();
    await expect(tree.getByRole("treeitem").count()).resolves.toBe(1);
    await page.getByLabel("Length x").fill("30");
    await page.getByLabel("Width y").fill("20");

    // The package substrate on the board, renamed "pkg".
    await page.getByRole("button", { name: "Add on board" }).click();
    await page.getByRole("menuitem", { name: "Substrate" }).click();
    await tree.getByRole("treeitem", { name: /^substrate,/ }).waitFor();
    const id = page.getByLabel("Id", { exact: true });
    await id.fill("pkg");
    await id.press("Enter");
    await tree.getByRole("treeitem", { name: /^pkg,/, selected: true }).waitFor();
    await page.getByLabel("Position x").fill("4");
    await page.getByLabel("Position y").fill("-2");
    // a new element starts with the typical tolerances of its place: solder stand-off ±15 µm here
    const standOff = page.getByRole("group", { name: "Height of each support tolerance" });
    await expect(standOff.getByLabel("± Tolerance").inputValue()).resolves.toBe("15");
    await standOff.getByLabel("± Tolerance").fill("12");

    // An accelerometer and a magnetometer on it.
    await page.getByRole("button", { name: "Add on pkg" }).click();
    await page.getByRole("menuitem", { name: "Accelerometer die" }).click();
    await tree.getByRole("treeitem", { name: /^accel,/, selected: true }).waitFor();
    await page.getByRole("group", { name: "Axis alignment, each angle tolerance" }).getByLabel("± Tolerance").fill("0.5");
    await tree.getByRole("treeitem", { name: /^pkg,/ }).click();
    await page.getByRole("button", { name: "Add on pkg" }).click();
    await page.getByRole("menuitem", { name: "Magnetometer die" }).click();
    await tree.getByRole("treeitem", { name: /^mag,/, selected: true }).waitFor();
    await page.getByRole("group", { name: "Height of each support tolerance" }).getByLabel("± Tolerance").fill("3");

    // Off its parent's footprint: the validator's message under the field, the tree marks it, nothing is saved.
    await page.getByLabel("Position x").fill("5");
    await page
      .getByRole("group", { name: "Element mag" })
      .getByText(/The centre of "mag" at \(5, 0\) mm is off the .* top face of its parent "pkg"/)
      .waitFor();
    await page.getByRole("region", { name: "Problems" }).getByText("mag", { exact: true }).waitFor();
    await tree.getByRole("treeitem", { name: /^mag, magnetometer, 1 problem/ }).waitFor();
    // the status follows the autosave tick, which waits for the edit to settle
    await page.getByText("Not saved: 1 problem to fix").waitFor({ timeout: 30_000 });
    await screenshot(page, "editor-new-stack-error");

    // Leaving now warns, because the server does not have the last edits.
    await page.getByRole("link", { name: "Harbour compass module, rev A" }).click();
    const leave = page.getByRole("dialog", { name: "Leave without saving?" });
    await leave.waitFor();
    await leave.getByRole("button", { name: "Cancel" }).click();
    await leave.waitFor({ state: "detached" });
    await tree.waitFor();

    const savedBefore = await saves(page);
    await page.getByLabel("Position x").fill("0.5");
    await expect.poll(() => page.getByText(/is off the/).count()).toBe(0);
    await waitSaved(page, savedBefore);

    // The compass pair is there: the estimate shows a heading error; a requirement gets its predicted yield.
    await page.getByRole("button", { name: "Add requirement" }).click();
    await expect(page.getByLabel("Requirement 1 metric").inputValue()).resolves.toBe("heading.maxAbsDeg");
    await page.getByLabel("Requirement 1 limit").fill("1.5");
    await page.getByLabel("Requirement 1 yield target").fill("99");
    await page.getByRole("list", { name: "Predicted yield per requirement" }).getByText("heading.maxAbsDeg").waitFor({ timeout: 30_000 });
    const heading = await settledHeading(page);
    expect(Number(heading)).toBeGreaterThan(0);
    await waitSaved(page, savedBefore + 1);
    await screenshot(page, "editor-new-stack");

    // Reload: the tree and values come back from the server.
    await page.reload();
    await tree.waitFor();
    const ids = await tree.getByRole("treeitem").evaluateAll((els) => els.map((e) => e.getAttribute("data-id")));
    expect(ids).toEqual(["board", "pkg", "accel", "mag"]);
    await expect(page.getByLabel("pkg.bondLine tolerance").inputValue()).resolves.toBe("12");
    await expect(page.getByLabel("accel.axis tolerance").inputValue()).resolves.toBe("0.5");
    expect(unexpectedProblems(problems)).toEqual([]);
  });

  it("starts a new package from a template: elements, requirements and typical tolerances in place, a slip flagged at once", async () => {
    const { page, problems } = await e2e.session();
    await signInAs(page, "engineer@example.com");
    await page.getByRole("button", { name: "New project" }).click();
    const dialog = page.getByRole("dialog", { name: "New project" });
    await dialog.getByLabel("Project name").fill("Kestrel tracker, dies side by side");
    await dialog.getByRole("button", { name: "Create project" }).click();
    await page.getByRole("heading", { name: "Kestrel tracker, dies side by side", level: 1 }).waitFor();
    await page.getByRole("button", { name: "New stack from a template…" }).click();
    const picker = page.getByRole("dialog", { name: "New stack from a template" });
    await picker.getByRole("radio", { name: /Dies side by side on a substrate/ }).click();
    await picker.getByRole("button", { name: "Start from this template" }).click();

    const tree = page.getByRole("tree", { name: "Elements" });
    await tree.waitFor();
    await expect(tree.getByRole("treeitem").count()).resolves.toBe(6);
    // the template has no geometric slip; its requirements come with it, the yield in %
    expect(await tree.getByRole("treeitem", { name: /geometry warning/ }).count()).toBe(0);
    await expect(
      page
        .getByRole("table", { name: "Requirements" })
        .getByLabel(/^Requirement \d+ yield target$/)
        .count(),
    ).resolves.toBe(4);
    expect(await page.getByLabel("Requirement 1 yield target").inputValue()).toBe("99.73");
    await settledHeading(page);
    // typical values in place beside the tolerances of the magnetometer
    await tree.getByRole("treeitem", { name: /^mag,/ }).click();
    const form = page.getByRole("group", { name: "Element mag" });
    await form.getByText("typical ±1°").first().waitFor();
    await form.getByText("typical ±5 µm").first().waitFor();

    // the magnetometer put where the gyroscope is: both flagged at once, the reason beside it
    await page.getByLabel("Position x").fill("0.6");
    await page.getByLabel("Position y").fill("-0.65");
    await tree.getByRole("treeitem", { name: /^mag, .*geometry warning/ }).waitFor();
    await tree.getByRole("treeitem", { name: /^gyro, .*geometry warning/ }).waitFor();
    await page
      .getByRole("list", { name: "Geometry warnings of mag" })
      .getByText(/overlaps .*gyro/)
      .waitFor();
    expect(unexpectedProblems(problems)).toEqual([]);
  });

  it("opens an approved revision read-only, starts a draft from it, exports and imports stack files", async () => {
    const { page, problems } = await e2e.session();
    await signInAs(page, "engineer@example.com");
    await openDemoRevision(page, 1);
    await page.getByText(/^Approved by .*: frozen\.$/).waitFor();
    await expect(page.getByLabel("mag.bondLine tolerance").isDisabled()).resolves.toBe(true);
    await expect(page.getByRole("button", { name: "Submit for review" }).count()).resolves.toBe(0);
    await screenshot(page, "editor-approved-read-only");

    // Export: the file is the stack as stored.
    const [download] = await Promise.all([page.waitForEvent("download"), page.getByRole("button", { name: "Export" }).click()]);
    expect(download.suggestedFilename()).toMatch(/-rev1\.stack\.json$/);
    const exported = JSON.parse(await streamText(await download.createReadStream()));
    const stored = await page.evaluate(async () => {
      const path = location.pathname.split("/");
      return (await (await fetch(`/api/revisions/${path[path.length - 1]}`)).json()).stack;
    });
    expect(exported).toEqual(stored);

    // A new draft from the approved revision opens editable, with the same content.
    await page.getByRole("button", { name: "Start a new draft from this revision" }).click();
    await page.getByRole("heading", { name: "Revision 3", level: 1 }).waitFor();
    await expect(page.getByLabel("mag.bondLine tolerance").isDisabled()).resolves.toBe(false);

    // Import a broken file: refused with the paths of its problems, the draft unchanged.
    const broken = {
      ...exported,
      elements: exported.elements.map((e: { id: string; size: object }) => (e.id === "mag" ? { ...e, size: { x: 0, y: 1, z: 0.2 } } : e)),
    };
    await page
      .getByTestId("import-stack-file")
      .setInputFiles({ name: "broken.stack.json", mimeType: "application/json", buffer: Buffer.from(JSON.stringify(broken)) });
    const refused = page.getByRole("dialog", { name: "This stack file cannot be imported" });
    await refused.getByText("length x (mm)", { exact: true }).waitFor();
    await refused.getByText("mag", { exact: true }).waitFor();
    await refused.getByText("The length x (mm) must be greater than 0").waitFor();
    await screenshot(page, "editor-import-refused");
    await refused.getByRole("button", { name: "Close" }).first().click();

    // Import a good one: it replaces the stack in one undoable step.
    const renamed = {
      ...exported,
      name: "Imported variant",
      elements: exported.elements.filter((e: { id: string }) => e.id !== "gyro" && e.id !== "accel" && e.id !== "mag"),
    };
    await page
      .getByTestId("import-stack-file")
      .setInputFiles({ name: "variant.stack.json", mimeType: "application/json", buffer: Buffer.from(JSON.stringify(renamed)) });
    const tree = page.getByRole("tree", { name: "Elements" });
    await tree.getByRole("treeitem", { name: /^gyro,/ }).waitFor({ state: "detached" });
    await expect(tree.getByRole("treeitem").count()).resolves.toBe(3);
    // The requirements on the removed dies are now flagged, and the draft is not saved until they are fixed or undone.
    await page.getByText(/problems: the draft is saved once they are fixed/).waitFor();
    await page.getByRole("button", { name: "Undo" }).click();
    await tree.getByRole("treeitem", { name: /^gyro,/ }).waitFor();
    await expect(tree.getByRole("treeitem").count()).resolves.toBe(6);
    expect(unexpectedProblems(problems)).toEqual([]);
  });

  it("goes through review: the engineer submits, the reviewer sends it back with a comment", async () => {
    const engineer = await e2e.session();
    await signInAs(engineer.page, "engineer@example.com");
    await openDemoRevision(engineer.page, 2);
    await submitConfirmingFailures(engineer.page, 2);
    await engineer.page.getByText(/^In review since/).waitFor();
    await expect(engineer.page.getByLabel("mag.bondLine tolerance").isDisabled()).resolves.toBe(true);

    const reviewer = await e2e.session();
    await signInAs(reviewer.page, "reviewer@example.com");
    await openDemoRevision(reviewer.page, 2);
    await reviewer.page.getByRole("button", { name: "Approve…" }).waitFor();
    await reviewer.page.getByRole("button", { name: "Send back…" }).click();
    const back = reviewer.page.getByRole("dialog", { name: "Send revision 2 back" });
    await back.getByRole("button", { name: "Send back to draft" }).click();
    await back.getByText("Say why the revision goes back").waitFor();
    await back.getByLabel("Reason").fill("The film attach on the magnetometer needs the supplier's bond-line data first.");
    await back.getByRole("button", { name: "Send back to draft" }).click();
    await back.waitFor({ state: "detached" });
    await reviewer.page.getByText("Draft, read only for your role").waitFor();
    await reviewer.page
      .getByRole("list", { name: "Review notes" })
      .getByText(/needs the supplier's bond-line data/)
      .waitFor();
    await screenshot(reviewer.page, "editor-reviewer-sent-back");

    await engineer.page.reload();
    await engineer.page.getByRole("button", { name: "Submit for review" }).waitFor();
    await engineer.page
      .getByRole("list", { name: "Review notes" })
      .getByText(/sent back/)
      .waitFor();

    // Submitted again, the reviewer approves it: frozen, and listed as approved on the project page.
    await submitConfirmingFailures(engineer.page, 2);
    await engineer.page.getByText(/^In review since/).waitFor();
    await reviewer.page.reload();
    await reviewer.page.getByRole("button", { name: "Approve…" }).click();
    const approve = reviewer.page.getByRole("dialog", { name: "Approve revision 2" });
    await approve.getByLabel("Comment").fill("Fine for the second build.");
    await approve.getByRole("button", { name: "Approve revision" }).click();
    await reviewer.page.getByText(/^Approved by .*: frozen\.$/).waitFor();
    await reviewer.page.getByRole("link", { name: "Ridgeline trail watch: 9-axis sensor module" }).click();
    const list = reviewer.page.getByRole("table", { name: "Stack revisions" });
    await list.getByRole("row", { name: /^2 .*Approved/ }).waitFor();
    await screenshot(reviewer.page, "editor-revisions-after-approval");
    expect(unexpectedProblems(engineer.problems)).toEqual([]);
    expect(unexpectedProblems(reviewer.problems)).toEqual([]);
    // two submissions, each through the submit dialog and its requirement check on the server
  }, 240_000);
});

async function streamText(stream: NodeJS.ReadableStream): Promise<string> {
  const chunks: Buffer[] = [];
  for await (const c of stream) chunks.push(Buffer.from(c as Buffer));
  return Buffer.concat(chunks).toString("utf8");
}
