/**
 * A revision from submit to approval, with nobody telling anyone by hand (issue 11): the
 * engineer submits; the reviewer sees it counted in the navigation and the project list, finds it in the notifications menu, follows the link,
 * reads what changed and approves; the engineer finds the approval in the same menu.
 */
import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { signInAs } from "./support/browser";
import { submitConfirmingFailures } from "./support/review";
import { setupE2E, unexpectedProblems } from "./support/setup";

const e2e = setupE2E();
const PROJECT = "Ridgeline trail watch: 9-axis sensor module";

/** Opens the notifications menu and follows the unread notification whose title matches. */
async function followNotification(page: Page, title: RegExp) {
  await page.getByRole("button", { name: /^Notifications, [1-9]\d* unread$/ }).click();
  const menu = page.getByRole("dialog", { name: "Notifications" });
  await menu.getByRole("button", { name: title }).click();
  await menu.waitFor({ state: "detached" });
}

describe("review through notifications", () => {
  it("the reviewer is told, reads the diff and approves; the engineer is told", async () => {
    const engineer = await e2e.session();
    await signInAs(engineer.page, "engineer@example.com");
    await engineer.page.getByRole("link", { name: PROJECT }).first().click();
    await engineer.page.getByRole("link", { name: "Open revision 2" }).click();
    await submitConfirmingFailures(engineer.page, 2);
    await engineer.page.getByText(/^In review since/).waitFor();

    // the reviewer signs in and is told; the link leads to the revision
    const reviewer = await e2e.session();
    await signInAs(reviewer.page, "reviewer@example.com");
    // it waits: counted beside Home in the navigation and on the project's row of the list
    const home = reviewer.page.getByRole("navigation", { name: "Main" }).getByTestId("nav-count-home");
    await expect(home.textContent()).resolves.toMatch(/^[1-9]\d* waiting for you$/);
    const row = reviewer.page.getByRole("table", { name: "Projects" }).getByRole("row").filter({ hasText: PROJECT });
    await row.getByText(/^1 revision/).waitFor();
    await followNotification(reviewer.page, new RegExp(`^Revision 2 of “${PROJECT}” waits for your review`));
    await reviewer.page.getByRole("heading", { name: "Revision 2" }).waitFor();
    expect(new URL(reviewer.page.url()).pathname).toMatch(/^\/projects\/[\w-]+\/revisions\/[\w-]+$/);

    // what changed, on the page before anything is pressed, and again in the approval dialog
    const onPage = reviewer.page.getByRole("region", { name: "What changed" });
    await onPage.getByText("What changed since revision 1: 4 changes").waitFor();
    await expect(onPage.getByRole("listitem").filter({ hasText: "mag: bond-line thickness" }).textContent()).resolves.toMatch(
      /changed\s*10 µm → 15 µm/,
    );
    await reviewer.page.getByRole("button", { name: "Approve…" }).click();
    const approve = reviewer.page.getByRole("dialog", { name: "Approve revision 2" });
    const changes = approve.getByRole("region", { name: "What changed" });
    await changes.getByText("What changed since revision 1: 4 changes").waitFor();
    const bondLine = changes.getByRole("listitem").filter({ hasText: "mag: bond-line thickness" });
    await expect(bondLine.textContent()).resolves.toMatch(/changed\s*10 µm → 15 µm/);
    await approve.getByRole("button", { name: "Approve revision" }).click();
    await reviewer.page.getByText(/^Approved by .*: frozen\.$/).waitFor();

    // the engineer is told (the menu polls; a reload asks at once)
    await engineer.page.reload();
    await followNotification(engineer.page, new RegExp(`^Revision 2 of “${PROJECT}” was approved`));
    await engineer.page.getByText(/^Approved by .*: frozen\.$/).waitFor();
    expect(unexpectedProblems(engineer.problems)).toEqual([]);
    expect(unexpectedProblems(reviewer.problems)).toEqual([]);
  }, 180_000);
});
