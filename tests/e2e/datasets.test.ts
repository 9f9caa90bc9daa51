import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { screenshot, signInAs } from "./support/browser";
import { setupE2E, unexpectedProblems } from "./support/setup";

const e2e = setupE2E();

// Invented first-build measurements: magnetometer placement rotation in mrad, bond-line height at one corner.
const GOOD = [
  "unit,mag yaw [mrad],mag bond line A [um]",
  ...Array.from(
    { length: 40 },
    (_, i) =>
      `FB-${String(i + 1).padStart(2, "0")},${(0.8 + (((i * 7) % 13) - 6) * 0.35).toFixed(2)},${(10.4 + (((i * 5) % 9) - 4) * 0.15).toFixed(2)}`,
  ),
].join("\n");
const BAD = "unit,tilt_x [deg]\nFB-01,0.02\nFB-02,abc\n";

describe("data sets", () => {
  it("an engineer uploads measurements, maps them to tolerance sources and reads their capability", async () => {
    const { page, problems } = await e2e.session();
    await signInAs(page, "engineer@example.com");
    await page
      .getByRole("table", { name: "Projects" })
      .getByRole("link", { name: /Ridgeline/ })
      .click();
    await page.waitForURL(/\/projects\/[0-9a-f-]{36}$/);
    const projectUrl = page.url();

    // The demo's first build is on the panel, with who sent it.
    const panel = page.getByRole("table", { name: "Data sets" });
    const demoRow = panel.getByRole("row", { name: /ridgeline-first-build-mag\.csv/ });
    await demoRow.waitFor();
    await expect(demoRow.getByText("Ezra Lindqvist").count()).resolves.toBe(1);
    await expect(demoRow.getByText("mag.yaw").count()).resolves.toBe(1);

    // A file with a word in a number column is refused with its row and column; nothing is added.
    await page
      .getByLabel("Measurement file (CSV or XLSX)")
      .setInputFiles({ name: "tilt-bad.csv", mimeType: "text/csv", buffer: Buffer.from(BAD) });
    const refusal = page.getByRole("alert").filter({ hasText: "The file was not accepted" });
    await refusal.getByText("Row 3, column B (tilt_x [deg]): “abc” is not a number.").waitFor();
    await expect(panel.getByRole("row").count()).resolves.toBe(2); // header + the demo data set
    await screenshot(page, "datasets-refused");

    // A good file opens its own page with the first rows.
    await page
      .getByLabel("Measurement file (CSV or XLSX)")
      .setInputFiles({ name: "first-build-40.csv", mimeType: "text/csv", buffer: Buffer.from(GOOD) });
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
    await page.getByText("mrad converted to ° (× 0.0572958)").waitFor();
    const statList = page.locator('dl[aria-label="Column statistics"]');
    await statList.getByText("40", { exact: true }).waitFor();
    await statList.getByText(/±0\.4° normal/).waitFor();
    const cpk = await statList
      .locator("div", { hasText: /^Cpk\s*\d/ })
      .locator("dd")
      .innerText();
    expect(Number(cpk.split(/\s/)[0])).toBeGreaterThan(0.5);
    await page.locator('svg[data-chart="tolerance-window"]').waitFor();
    await page
      .getByLabel("Capability statement")
      .getByText(/^Over 40 units, Cpk over all units reads \d\.\d\d; with 95 % confidence the process is at least \d\.\d\d/)
      .waitFor();
    await page.getByText(/A\* = \d\.\d{3}, p = /).waitFor();
    await screenshot(page, "datasets-capability");

    // The bond line, less its nominal: in µm around 0.4.
    await page.getByLabel("Column for capability").selectOption("mag bond line A [um]");
    await page.getByText("the nominal 10 µm taken off each value.", { exact: false }).waitFor();

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
    await page
      .getByRole("list", { name: "Project activity" })
      .getByText(/mapped the data set “first-build-40\.csv”/)
      .waitFor();
    await screenshot(page, "datasets-project-panel");

    expect(unexpectedProblems(problems)).toEqual([]);
  });

  it("a corner-height file with gaps, sent for one lot, maps in one step to the bond line and reads its capability with its confidence", async () => {
    const { page, problems } = await e2e.session();
    await signInAs(page, "engineer@example.com");
    await page
      .getByRole("table", { name: "Projects" })
      .getByRole("link", { name: /Ridgeline/ })
      .click();
    await page.waitForURL(/\/projects\/[0-9a-f-]{36}$/);
    const projectUrl = page.url();
    // 30 magnetometers (0.9 × 0.5 mm) in two lots; heights 10 µm + a wedge, three cells missing
    const X = [-0.45, 0.45, 0.45, -0.45],
      Y = [-0.25, -0.25, 0.25, 0.25];
    const rows = Array.from({ length: 30 }, (_, i) => {
      const b = 2 + (i % 4) * 0.5,
        a = 10 + 0.2 * (i % 3);
      const h = X.map((x, k) => (a + b * x - Y[k]).toFixed(3));
      if (i === 3) h[1] = "NA";
      if (i === 9) h[2] = "";
      if (i === 20) h[0] = "n/a";
      return [`M${i + 1}`, i < 15 ? "L2611" : "L2612", ...h].join(",");
    });
    const CORNERS = ["unit,lot,h0 [um],h1 [um],h2 [um],h3 [um]", ...rows].join("\n");
    await page.getByLabel("Lot of the upload").fill("L2611-12");
    await page.getByLabel("Note on the upload").fill("corner heights, first build");
    await page
      .getByLabel("Measurement file (CSV or XLSX)")
      .setInputFiles({ name: "mag-corners.csv", mimeType: "text/csv", buffer: Buffer.from(CORNERS) });
    await page.waitForURL(/\/datasets\/[0-9a-f-]{36}/);
    await page.getByRole("heading", { name: "mag-corners.csv", level: 1 }).waitFor();

    // one step: four columns to the four supports, the nominal 10 µm from the stack's bond line
    const mapping = page.getByRole("table", { name: "Column mapping" });
    await mapping.getByLabel("Tolerance source for h0 [µm]").locator('option[value="mag.bondLine#0"]').waitFor({ state: "attached" });
    for (const k of [0, 1, 2, 3]) await mapping.getByLabel(`Tolerance source for h${k} [µm]`).selectOption(`mag.bondLine#${k}`);
    await expect(mapping.getByLabel("Nominal of h2 [µm]").inputValue()).resolves.toBe("10");
    await page.getByLabel("Lot column").selectOption("lot");
    await page.getByRole("button", { name: "Save mapping (4)" }).click();
    await page
      .getByRole("list", { name: "Sources measured by several columns" })
      .getByText(/mag\.bondLine.*4 of 4 columns: 27 complete rows, 3 left out for a gap/)
      .waitFor();
    await screenshot(page, "datasets-pooled-mapping");

    // the capability of one corner: a statement with its confidence, units in production order inside the window, lots
    await page.getByLabel("Column for capability").selectOption("h1 [um]");
    const statement = page.getByLabel("Capability statement");
    await statement
      .getByText(/^Over 29 units, Cpk within lots reads \d\.\d\d; with 95 % confidence the process is at least \d\.\d\d/)
      .waitFor();
    const chart = page.locator('svg[data-chart="tolerance-window"]');
    await expect(chart.locator("circle[data-unit]").count()).resolves.toBe(29);
    await expect(chart.locator('[data-layer="control-limits"] line').count()).resolves.toBe(3);
    await page.getByRole("table", { name: "Lots" }).getByRole("cell", { name: "L2612" }).waitFor();
    await page.getByText("+ 1 gaps").waitFor();
    await screenshot(page, "datasets-capability-window");
    // the chart leaves as a drawing, named after the data set and the column, every unit in it
    await page
      .getByRole("figure", { name: "Tolerance window of h1 [um]" })
      .getByRole("button", { name: /^Download Units of h1 \[um\]/ })
      .click();
    const [file] = await Promise.all([page.waitForEvent("download"), page.getByRole("menuitem", { name: "SVG drawing" }).click()]);
    expect(file.suggestedFilename()).toBe("mag-corners-tolerance-window-h1-um.svg");
    const drawing = readFileSync((await file.path())!, "utf8");
    expect(drawing).toContain("<svg");
    expect((drawing.match(/<circle\b/g) ?? []).length).toBeGreaterThanOrEqual(29);

    // on the project, grouped by lot
    await page.goto(projectUrl);
    await page.getByLabel("Group data sets by").selectOption("lot");
    await page.getByRole("table", { name: "Data sets" }).locator('tr[data-group="Lot L2611-12"]').waitFor();
    await page.getByRole("table", { name: "Data sets" }).getByText("corner heights, first build").waitFor();
    expect(unexpectedProblems(problems)).toEqual([]);
  });

  it("runs the demo stack as built from the first-build data set and compares it with the design study", { timeout: 240_000 }, async () => {
    const { page, problems } = await e2e.session();
    await signInAs(page, "engineer@example.com");
    await page
      .getByRole("table", { name: "Projects" })
      .getByRole("link", { name: /Ridgeline/ })
      .click();
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
    await page
      .getByRole("table", { name: "Projects" })
      .getByRole("link", { name: /Ridgeline/ })
      .click();
    await page.getByRole("table", { name: "Data sets" }).getByRole("link", { name: "ridgeline-first-build-mag.csv" }).click();
    await page.getByRole("heading", { name: "ridgeline-first-build-mag.csv", level: 1 }).waitFor();
    await page.getByRole("table", { name: "Column mapping" }).getByText("mag.yaw", { exact: true }).waitFor();
    await expect(page.getByRole("button", { name: /Save mapping/ }).count()).resolves.toBe(0);
    await expect(page.getByRole("button", { name: "Run as built" }).count()).resolves.toBe(0);
    await expect(page.getByLabel("Measurement file (CSV or XLSX)").count()).resolves.toBe(0);
    expect(unexpectedProblems(problems)).toEqual([]);
  });
});
