import type { Page } from "playwright-core";

/**
 * Submits the open draft through the submit dialog. The demo draft misses a requirement by the
 * live estimate: the dialog lists it, and the engineer confirms before submitting. The longer
 * timeouts: the editor's page is busy while it loads (3D view, live estimate), and the server
 * judges the requirements before it answers.
 */
export async function submitConfirmingFailures(page: Page, number: number) {
  await page.getByRole("button", { name: "Submit for review" }).click({ timeout: 30_000 });
  const dialog = page.getByRole("dialog", { name: `Submit revision ${number} for review` });
  const failing = dialog.getByRole("region", { name: "Requirements not met" });
  await failing
    .getByText(/live estimate, 3,000 trials/)
    .first()
    .waitFor({ timeout: 30_000 });
  await dialog.getByRole("checkbox", { name: /I have seen what fails/ }).check();
  await dialog.getByRole("button", { name: "Submit anyway" }).click();
  await dialog.waitFor({ state: "detached", timeout: 30_000 });
}
