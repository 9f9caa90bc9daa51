import { describe, expect, it } from "vitest";
import { screenshot, signInAs } from "./support/browser";
import { setupE2E, unexpectedProblems } from "./support/setup";

const e2e = setupE2E();

// Invented first-build measurements: magnetometer placement rotation in mrad, bond-line height at one corner.
const GOOD = [
  "unit,mag yaw [mrad],mag bond line A [um]",
  ...Array.from({ length: 40 }, (_, i) => `FB-${String(i + 1).padStart(2, "0")},${(0.8 + (((i * 7) % 13) - 6) * 0.35).toFixed(2)},${(10.4 + (((i * 5) % 9) - 4) * 0.15).toFixed(2)}`),
].join("\n");
const BAD = "unit,tilt_x [deg]\nFB-01,0.02\nFB-02,abc\n";

describe("data sets", () => {
  it("an engineer uploads measurements, maps them to tolerance sources and reads their capability", async () => {
    const { page, problems } = await e2e.session();
    await signInAs(page, "engineer@example.com");
    await page.getByRole("table", { name: "Projects" }).getByRole("link", { name: /Ridgeline/ }).click();
    await page.waitForURL(/\/projects\/[0-9a-f-]{36}$/);
    const projectUrl = page.url();

    // The demo's first build is on the panel, with who sent it.
    const panel = page.getByRole("table", { name: "Data sets" });
    const demoRow = panel.getByRole("row", { name: /ridgeline-first-build-mag\.csv/ });
    await demoRow.waitFor();
    await expect(demoRow.getByText("Ezra Lindqvist").count()).resolves.toBe(1);
    await expect(demoRow.getByText("mag.yaw").count()).resolves.toBe(1);

    // A file with a word in a number column is refused with its row and column; nothing is added.
    await page.getByLabel("Measurement file (CSV or XLSX)").setInputFiles({ name: "tilt-bad.csv", mimeType: "text/csv", buffer: Buffer.from(BAD) });
    const refusal = page.getByRole("alert").filter({ hasText: "The file was not accepted" });
    await refusal.getByText("Row 3, column B (tilt_x [deg]): “abc” is not a number.").waitFor();
    await expect(panel.getByRole("row").count()).resolves.toBe(2); // header + the demo data set
    await screenshot(page, "datasets-refused");

    // A good file opens its own page with the first rows.
    await page.getByLabel("Measurement file (CSV or XLSX)").setInputFiles({ name: "first-build-40.csv", mimeType: "text/csv", buffer: Buffer.from(GOOD) });
    await page.waitForURL(/\/projects\/[0-9a-f-]{36}\/datasets\/[0-9a-f-]{36}/);
    await page.getByRole("heading", { name: "first-build-40.csv", level: 1 }).waitFor();
    const preview = page.getByRole("table", { name: "Preview of the first rows" });
    await preview.getByRole("cell", { name: "FB-01", exact: true }).waitFor();
    await expect(preview.getByRole("row").count()).resolves.toBe(21);

    // Map the two columns on the approved revision; the bond line is measured absolute, around 10 µm.
    const mapping = page.getByRole("table", { name: "Column mapping" });
    const yawSource = mapping.getByLabel("Tolerance source for mag yaw [mrad]");
    // only angle sources are offered for a column in mrad (the revision's sources arrive after the page)
    await yawSource.locator('option[value="mag.yaw"]').waitFor({ state: "attached" });
    const yawOptions = await yawSource.locator("option").allInnerTexts();
    expect(yawOptions.some((o) => o.startsWith("mag.yaw "))).toBe(true);
    expect(yawOptions.some((o) => o.startsWith("mag.bondLine "))).toBe(false);
    await yawSource.selectOption("mag.yaw");
    await mapping.getByLabel("Tolerance source for mag bond line A [µm]").selectOption("mag.bondLine");
    await mapping.getByLabel("Nominal of mag bond line A [µm]").fill("10");
    await page.getByRole("button", { name: "Save mapping (2)" }).click();
    await page.getByRole("button", { name: "Save mapping" }).and(page.locator("[disabled]")).waitFor();
    await screenshot(page, "datasets-mapping");

    // The capability of the yaw column: against ±0.4° of mag.yaw, converted from mrad.
    await page.getByLabel("Column for capability").selectOption("mag yaw [mrad]");
    await page.getByText("converted from mrad to °").waitFor();
    const statList = page.locator('dl[aria-label="Column statistics"]');
    await statList.getByText("40", { exact: true }).waitFor();
    await statList.getByText(/±0\.4° normal/).waitFor();
    const cpk = await statList.locator("div", { hasText: /^Cpk/ }).locator("dd").innerText();
    expect(Number(cpk.split(/\s/)[0])).toBeGreaterThan(0.5);
    await page.locator('figure[data-chart="capability-histogram"] svg').first().waitFor();
    await page.getByText(/A\* = \d\.\d{3}, p = /).waitFor();
    await screenshot(page, "datasets-capability");

    // The bond line, less its nominal: in µm around 0.4.
    await page.getByLabel("Column for capability").selectOption("mag bond line A [um]");
    await page.getByText("less the nominal 10 µm", { exact: false }).waitFor();

    // The demo data set flags its re-picked unit as an outlier, by its row in the file.
    await page.goto(projectUrl);
    await page.getByRole("table", { name: "Data sets" }).getByRole("link", { name: "ridgeline-first-build-mag.csv" }).click();
    await page.getByRole("heading", { name: "ridgeline-first-build-mag.csv", level: 1 }).waitFor();
    await page.getByRole("region", { name: "Outliers" }).getByText("Row 32").waitFor();
    await page.getByText("not normal").waitFor();
    await screenshot(page, "datasets-demo-capability");

    // Back on the project, the new data set is listed with its mappings, and the activity says what happened.
    await page.goto(projectUrl);
    const row = page.getByRole("table", { name: "Data sets" }).getByRole("row", { name: /first-build-40\.csv/ });
    await row.getByText("mag.bondLine").waitFor();
    await page.getByRole("list", { name: "Project activity" }).getByText(/mapped the data set “first-build-40\.csv”/).waitFor();
    await screenshot(page, "datasets-project-panel");

    expect(unexpectedProblems(problems)).toEqual([]);
  });

  it("runs the demo stack as built from the first-build data set and compares it with the design study", { timeout: 240_000 }, async () => {
    const { page, problems } = await e2e.session();
    await signInAs(page, "engineer@example.com");
    await page.getByRole("table", { name: "Projects" }).getByRole("link", { name: /Ridgeline/ }).click();
    await page.getByRole("table", { name: "Data sets" }).getByRole("link", { name: "ridgeline-first-build-mag.csv" }).click();
    await page.getByRole("button", { name: "Run as built" }).click();
    const dialog = page.getByRole("dialog", { name: "Run as built" });
    // the demo's design study (200,000 trials) runs from the server's start; the list follows it
    const design = dialog.getByLabel("Design study to mirror");
    await design.waitFor({ timeout: 150_000 });
    await expect(design.locator("option").first().innerText()).resolves.toMatch(/^Study 1 · rev 1 · 200,000 trials, seed 2026/);
    await dialog.getByLabel("How mag.yaw is drawn").selectOption("resample");
    await screenshot(page, "datasets-as-built-dialog");
    await dialog.getByRole("button", { name: "Queue as-built study" }).click();

    // the compare page opens with the design as A and the as-built study as B
    await page.waitForURL(/\/projects\/[0-9a-f-]{36}\/compare\?a=[0-9a-f-]{36}&b=[0-9a-f-]{36}/);
    const b = page.getByRole("combobox", { name: "Study B" });
    await expect(b.locator("option:checked").innerText()).resolves.toMatch(/^Study 2 · rev 1 · .* · As built: mag\.yaw$/);
    // once it has run, the measured placement rotation shows among the tolerances that differ
    await page.getByRole("table", { name: "Tolerances that differ" }).getByText("mag.yaw").waitFor({ timeout: 150_000 });
    await screenshot(page, "datasets-as-built-compare");
    expect(unexpectedProblems(problems)).toEqual([]);
  });

  it("a reviewer reads data sets but has no upload or mapping controls", async () => {
    const { page, problems } = await e2e.session();
    await signInAs(page, "reviewer@example.com");
    await page.getByRole("table", { name: "Projects" }).getByRole("link", { name: /Ridgeline/ }).click();
    await page.getByRole("table", { name: "Data sets" }).getByRole("link", { name: "ridgeline-first-build-mag.csv" }).click();
    await page.getByRole("heading", { name: "ridgeline-first-build-mag.csv", level: 1 }).waitFor();
    await page.getByRole("table", { name: "Column mapping" }).getByText("mag.yaw", { exact: true }).waitFor();
    await expect(page.getByRole("button", { name: /Save mapping/ }).count()).resolves.toBe(0);
    await expect(page.getByRole("button", { name: "Run as built" }).count()).resolves.toBe(0);
    await expect(page.getByLabel("Measurement file (CSV or XLSX)").count()).resolves.toBe(0);
    expect(unexpectedProblems(problems)).toEqual([]);
  });
});
