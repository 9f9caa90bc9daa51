import { createHash } from "node:crypto";
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import type { Page } from "playwright-core";
import { screenshot, signInAs } from "./support/browser";
import { setupE2E, unexpectedProblems } from "./support/setup";

const e2e = setupE2E();

/** The demo seed queues the project's first study; the server runs it as it starts. */
async function waitForDemoStudy(page: Page) {
  const end = Date.now() + 150_000;
  for (;;) {
    const res = await page.request.get("/api/projects");
    const { projects } = (await res.json()) as { projects: Array<{ lastStudy: { status: string } | null }> };
    if (projects[0]?.lastStudy?.status === "finished") return;
    if (Date.now() > end) throw new Error(`the demo study did not finish: ${JSON.stringify(projects[0]?.lastStudy)}`);
    await page.waitForTimeout(1000);
  }
}

describe("a supplier report from the demo project", () => {
  it("an engineer builds it, a reviewer releases and sends it, it arrives in the outbox, and the supplier downloads and acknowledges it", async () => {
    // ---- the engineer builds the draft from the demo's finished study
    const eng = await e2e.session();
    await signInAs(eng.page, "engineer@example.com");
    await waitForDemoStudy(eng.page);
    await eng.page.getByRole("link", { name: /Ridgeline trail watch/ }).click();
    await eng.page.getByRole("button", { name: "Build report" }).click();
    const build = eng.page.getByRole("dialog", { name: "Build a supplier report" });
    await build.getByRole("radio", { name: /Larkfield Assembly/ }).check();
    await build.getByLabel("Capability asked").fill("1.33");
    await build.getByRole("button", { name: "Build draft" }).click();
    await eng.page.waitForURL(/\/reports\/[0-9a-f-]{36}$/);
    await eng.page.getByRole("heading", { name: "TR-0001 revision 1" }).waitFor();
    await eng.page.getByText("Draft: not released").waitFor();
    const tolerances = eng.page.getByRole("table", { name: "Tolerances" });
    for (const source of ["asic.bondLine", "mag.bondLine", "mag.yaw"]) await tolerances.getByText(source, { exact: true }).waitFor();
    // an engineer cannot release, only a reviewer
    await expect(eng.page.getByRole("button", { name: "Release" }).count()).resolves.toBe(0);
    await screenshot(eng.page, "report-draft");
    const reportUrl = new URL(eng.page.url()).pathname;

    // ---- the reviewer releases it and sends it to Larkfield's contacts
    const rev = await e2e.session();
    await signInAs(rev.page, "reviewer@example.com");
    await rev.page.goto(reportUrl);
    await rev.page.getByRole("heading", { name: "TR-0001 revision 1" }).waitFor({ timeout: 30_000 });
    await rev.page.getByRole("button", { name: "Release" }).click();
    const release = rev.page.getByRole("dialog", { name: /Release TR-0001 revision 1/ });
    await release.getByLabel("Review note").fill("Checked against approved revision 1.");
    await release.getByRole("button", { name: "Release report" }).click();
    const files = rev.page.getByRole("list", { name: "Stored files" });
    await files.waitFor();
    const shown = (await files.getByTitle("SHA-256 checksum of the file as stored and sent").first().innerText()).match(/[0-9a-f]{64}/)![0];
    const csvRes = await rev.page.request.get(`/api${reportUrl}/csv`);
    expect(
      createHash("sha256")
        .update(await csvRes.body())
        .digest("hex"),
    ).toBe(shown);
    await rev.page.getByRole("button", { name: "Send to supplier" }).click();
    const send = rev.page.getByRole("dialog", { name: /Send TR-0001 revision 1/ });
    await send.getByRole("list", { name: "Recipients" }).getByText("supplier@example.com").waitFor();
    await send.getByLabel("Message").fill("Please acknowledge before the first build.");
    await send.getByRole("button", { name: "Send report" }).click();
    await rev.page.getByText("Sent to 1 contact with the PDF attached").waitFor();
    await screenshot(rev.page, "report-released-sent");

    // ---- the mail arrives in the admin's outbox with the PDF
    const admin = await e2e.session();
    await signInAs(admin.page, "admin@example.com");
    await admin.page.getByRole("link", { name: "Outbox" }).click();
    const messages = admin.page.getByRole("table", { name: "Messages" });
    await messages.getByRole("button", { name: /TR-0001 revision 1: tolerances for Ridgeline/ }).click();
    await messages.getByText("supplier@example.com").first().waitFor();
    await messages.getByRole("link", { name: "TR-0001-r1-Larkfield-Assembly.pdf" }).waitFor();
    await messages.getByText("Please acknowledge before the first build.").waitFor();
    await screenshot(admin.page, "outbox");

    // ---- the supplier reads, downloads, asks and acknowledges
    const sup = await e2e.session();
    await signInAs(sup.page, "supplier@example.com");
    await sup.page.getByRole("table", { name: "Reports" }).getByRole("link", { name: "TR-0001 revision 1" }).click();
    await sup.page.getByRole("heading", { name: "TR-0001 revision 1" }).waitFor();
    await screenshot(sup.page, "report-supplier");
    const [download] = await Promise.all([sup.page.waitForEvent("download"), sup.page.getByRole("link", { name: "PDF" }).click()]);
    expect(download.suggestedFilename()).toBe("TR-0001-r1-Larkfield-Assembly.pdf");
    const pdf = readFileSync((await download.path())!);
    expect(pdf.subarray(0, 5).toString("latin1")).toBe("%PDF-");
    await sup.page.getByLabel("Your question").fill("Is the magnetometer bond line measured at its three supports?");
    await sup.page.getByRole("button", { name: "Ask a question" }).click();
    await sup.page
      .getByRole("list", { name: "Comments" })
      .getByText("Is the magnetometer bond line measured at its three supports?")
      .waitFor();
    await sup.page.getByRole("button", { name: "Acknowledge" }).click();
    const ack = sup.page.getByRole("dialog", { name: /Acknowledge TR-0001 revision 1/ });
    await ack.getByRole("button", { name: "Acknowledge" }).click();
    await sup.page.getByText("Acknowledged by Sam Whitcombe").waitFor();
    await expect(sup.page.getByRole("button", { name: "Acknowledge" }).count()).resolves.toBe(0);
    await screenshot(sup.page, "report-acknowledged");
    // the released report asks for first-build measurements: the supplier can send them from here
    await sup.page.getByRole("button", { name: "Send measurements" }).waitFor();

    // ---- the project shows what happened
    await eng.page.goto("/projects");
    await eng.page.getByRole("link", { name: /Ridgeline trail watch/ }).click();
    const activity = eng.page.getByRole("list", { name: "Project activity" });
    for (const text of [
      "released report TR-0001 revision 1",
      "sent report TR-0001 revision 1",
      "downloaded report TR-0001 revision 1 (PDF)",
      "acknowledged report TR-0001 revision 1",
    ]) {
      await activity.getByText(text, { exact: false }).waitFor();
    }
    await eng.page.getByRole("list", { name: "Project reports" }).getByText("Acknowledged").waitFor();
    await screenshot(eng.page, "project-reports");

    for (const s of [eng, rev, admin, sup]) expect(unexpectedProblems(s.problems)).toEqual([]);
  }, 300_000);
});
