/**
 * Studies in a real browser against the real server (fresh data folder, demo seed): an
 * engineer starts a study from the settings form with the field from a site, watches its
 * progress, reads every figure of the results, opens a worst trial in the 3D view, downloads
 * the result file, cancels and re-runs a study, and compares two studies, one of them the
 * same settings run on the draft revision. Studies are kept small: the machine has 2 cores.
 * Screenshots go to tests/e2e/.artifacts/.
 */
import { readFileSync } from "node:fs";
import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { join } from "node:path";
import { ARTIFACTS, screenshot as viewportShot, signInAs } from "./support/browser";
import { setupE2E, unexpectedProblems } from "./support/setup";

const e2e = setupE2E();

/**
 * The whole page: the app scrolls inside <main>, so the window is made as tall as the
 * content for the picture, then put back.
 */
async function screenshot(page: Page, name: string) {
  const size = page.viewportSize()!;
  const height = await page.evaluate(() => document.querySelector("main")?.scrollHeight ?? 0);
  if (height + 60 > size.height) {
    await page.setViewportSize({ width: size.width, height: Math.min(height + 60, 8000) });
    await page.waitForTimeout(600); // charts re-measure their boxes
  }
  await viewportShot(page, name);
  await page.setViewportSize(size);
}
const TRIALS = 20_000;

/** Shapes a recharts figure drew: bars, areas and lines with real path data. */
async function drawn(page: Page, selector: string) {
  return page.locator(selector).evaluateAll((figures) =>
    figures.map((f) => {
      const withData = (q: string) => [...f.querySelectorAll(q)].filter((el) => (el.getAttribute("d") ?? "").length > 10).length;
      return {
        svg: f.querySelectorAll("svg.recharts-surface").length,
        bars: withData(".recharts-bar-rectangle path"),
        areas: withData("path.recharts-area-area"),
        lines: withData("path.recharts-line-curve"),
      };
    }),
  );
}

async function openDemoProject(page: Page) {
  await page
    .getByRole("table", { name: "Projects" })
    .getByRole("link", { name: /Ridgeline/ })
    .click();
  await page.getByRole("heading", { name: /Ridgeline trail watch/, level: 1 }).waitFor();
}

/** Polls the study page until results show, noting each progress state on the way. */
async function watchUntilFinished(page: Page, timeoutMs: number) {
  const seen: string[] = [];
  const deadline = Date.now() + timeoutMs;
  const cards = page.getByRole("list", { name: "Requirements" });
  while (Date.now() < deadline) {
    if (await cards.isVisible()) return seen;
    const bar = page.getByRole("progressbar");
    if (await bar.isVisible().catch(() => false)) {
      const text = await bar.getAttribute("aria-valuetext").catch(() => null);
      if (text && seen[seen.length - 1] !== text) seen.push(text);
    }
    await page.waitForTimeout(250);
  }
  throw new Error(`the study did not finish in ${timeoutMs} ms; progress seen: ${seen.join(" | ")}`);
}

describe("studies", () => {
  let studyUrl = "";

  it("an engineer starts a study from the form, watches it run and reads every figure", async () => {
    const { page, problems } = await e2e.session();
    await signInAs(page, "engineer@example.com");
    await openDemoProject(page);
    const panel = page.getByRole("table", { name: "Studies" });
    await panel.getByRole("link", { name: "Study 1" }).waitFor();
    await screenshot(page, "studies-project-panel");

    // New study: the settings start from the newest study (the demo's, at the Alpine site).
    await page.getByRole("link", { name: "New study" }).click();
    await page.getByRole("heading", { name: "New study", level: 1 }).waitFor();
    const form = page.getByRole("form", { name: "Study settings" });
    await form.getByRole("table", { name: "Requirements of the revision" }).getByText("heading.maxAbsDeg").waitFor();
    await form.getByLabel("Trials", { exact: true }).fill(String(TRIALS));
    await form.getByLabel("Seed").fill("424242");
    await form.getByLabel("Label", { exact: true }).fill("Browser test, Bergen site");
    // The site: a new one, so the field is looked up again and shown before starting.
    await expect(form.getByRole("radio", { name: "From a site (WMM2025)" }).getAttribute("aria-checked")).resolves.toBe("true");
    await form.getByLabel("Latitude").fill("60.39");
    await form.getByLabel("Longitude").fill("5.32");
    await form.getByLabel("Altitude").fill("0");
    await form.getByLabel("Date").fill("2027-03-15");
    const found = form.getByLabel("Field at the site");
    await found.getByText("Inclination").waitFor();
    // The demo site's 63.6° gives way to Bergen's, about 73°, once the lookup answers.
    await found.getByText(/^7\d\.\d{3}°$/).waitFor();
    const dip = Number((await found.getByText(/^7\d\.\d{3}°$/).innerText()).replace("°", ""));
    expect(dip).toBeGreaterThan(70);
    expect(dip).toBeLessThan(76);
    await found.getByText(/nT$/).first().waitFor();
    await form.getByRole("radio", { name: "Latin hypercube" }).click();
    await screenshot(page, "studies-new-form");

    await form.getByRole("button", { name: "Start study" }).click();
    await page.waitForURL(/\/projects\/[0-9a-f-]{36}\/studies\/[0-9a-f-]{36}$/);
    studyUrl = new URL(page.url()).pathname;
    await page.getByRole("heading", { name: /Study 2/, level: 1 }).waitFor();
    // Progress shows as soon as the page opens (queued behind the demo study, or running).
    const progress = page.getByRole("progressbar");
    const sawProgress = await progress.waitFor({ timeout: 5000 }).then(
      () => true,
      () => false,
    );
    if (sawProgress) await screenshot(page, "studies-progress");
    const seen = await watchUntilFinished(page, 150_000);
    // A 20,000-trial study can finish between two polls; the page must still have shown where it was.
    expect(sawProgress || seen.length > 0).toBe(true);

    // Requirement cards with verdicts in the pass/fail colours.
    const cards = page.getByRole("list", { name: "Requirements" });
    await expect(cards.getByRole("listitem").count()).resolves.toBe(4);
    await cards
      .getByText(/^(Pass|Fail)$/)
      .first()
      .waitFor();
    await page
      .getByRole("complementary", { name: "Cautions" })
      .getByText(/must not be the only means of navigation/)
      .waitFor();
    // The WMM's dip is what the study ran with.
    await page
      .getByRole("region", { name: "Settings and run" })
      .getByText(`${dip.toFixed(3)}°`, { exact: false })
      .waitFor();

    // Every chart drew its data.
    const envelopes = await drawn(page, '[data-chart="envelope"]');
    expect(envelopes).toHaveLength(5);
    for (const e of envelopes) {
      expect(e.areas).toBeGreaterThanOrEqual(1);
      expect(e.lines).toBeGreaterThanOrEqual(1);
    }
    const [hist] = await drawn(page, '[data-chart="histogram"]');
    expect(hist.bars).toBeGreaterThan(10);
    const paretos = await drawn(page, '[data-chart="pareto"]');
    expect(paretos).toHaveLength(2);
    for (const p of paretos) {
      expect(p.bars).toBeGreaterThanOrEqual(2);
      expect(p.lines).toBe(1);
    }
    const [stackUp] = await drawn(page, '[data-chart="stack-up"]');
    expect(stackUp.bars).toBeGreaterThanOrEqual(12);
    const [conv] = await drawn(page, '[data-chart="convergence"]');
    expect(conv.lines).toBe(1);
    const [convYield] = await drawn(page, '[data-chart="convergence-yield"]');
    expect(convYield.areas + convYield.lines).toBe(2);
    const crossAxis = page.locator('[data-chart="cross-axis"]');
    await expect(crossAxis.count()).resolves.toBe(3);
    await expect(
      crossAxis
        .first()
        .getByRole("cell")
        .filter({ hasText: /^\d+\.\d+%$/ })
        .count(),
    ).resolves.toBe(6);

    // The histogram follows the metric picker, with the limit drawn.
    await page.getByLabel("Histogram metric").selectOption("accel~mag.relRotDeg");
    await page.locator('[data-chart="histogram"] .recharts-reference-line-line').first().waitFor({ state: "attached" });
    await page.getByText(/^limit 0\.50*°$/).waitFor();
    await page.getByRole("radio", { name: "Log" }).click();
    const [histLog] = await drawn(page, '[data-chart="histogram"]');
    expect(histLog.bars).toBeGreaterThan(10);
    // A chart leaves as a file: the histogram's PNG at twice its size on the page, drawn (not blank), and its SVG with the bars and the font.
    const histFigure = page.locator('[data-chart="histogram"]');
    const [w, h] = await histFigure.locator(".recharts-wrapper > svg").evaluate((s) => [s.clientWidth, s.clientHeight]);
    const chartFile = async (item: string) => {
      await histFigure.getByRole("button", { name: /^Download Histogram of / }).click();
      const [file] = await Promise.all([page.waitForEvent("download"), page.getByRole("menuitem", { name: item }).click()]);
      return { name: file.suggestedFilename(), bytes: readFileSync((await file.path())!) };
    };
    const png = await chartFile("PNG picture (2×)");
    expect(png.name).toBe("ridgeline-trail-watch-9-axis-sensor-module-study-2-histogram-accel-mag.relrotdeg.png");
    expect([png.bytes.readUInt32BE(16), png.bytes.readUInt32BE(20)]).toEqual([2 * w, 2 * h]);
    const inked = await page.evaluate(
      async (url) => {
        const img = new Image();
        img.src = url;
        await img.decode();
        const c = Object.assign(document.createElement("canvas"), { width: img.width, height: img.height });
        const g = c.getContext("2d")!;
        g.drawImage(img, 0, 0);
        const d = g.getImageData(0, 0, img.width, img.height).data;
        let n = 0;
        for (let i = 0; i < d.length; i += 4) if (d[i] + d[i + 1] + d[i + 2] < 600) n++;
        return n / (d.length / 4);
      },
      `data:image/png;base64,${png.bytes.toString("base64")}`,
    );
    expect(inked).toBeGreaterThan(0.02);
    const svg = await chartFile("SVG drawing");
    expect(svg.name).toBe("ridgeline-trail-watch-9-axis-sensor-module-study-2-histogram-accel-mag.relrotdeg.svg");
    const svgText = svg.bytes.toString("utf8");
    expect(svgText).toMatch(/^<\?xml[^]*<svg[^>]*xmlns="http:\/\/www\.w3\.org\/2000\/svg"/);
    expect(svgText).toContain("data:font/woff2;base64,");
    expect((svgText.match(/class="recharts/g) ?? []).length).toBe(0);
    expect((svgText.match(/<path/g) ?? []).length).toBeGreaterThan(10);
    // Choosing a requirement card points the contributors at it.
    await cards.getByRole("button", { name: /mag cross-axis total, x/ }).click();
    await expect(page.getByLabel("Contributors for requirement").inputValue()).resolves.toBe("mag.crossAxisTotalPct.x");
    await page.getByRole("radio", { name: "p95" }).first().click();
    await screenshot(page, "studies-results");

    // The result file, as stored.
    const [download] = await Promise.all([
      page.waitForEvent("download"),
      page.getByRole("button", { name: "Download result (JSON)" }).click(),
    ]);
    expect(download.suggestedFilename()).toMatch(/^ridgeline-trail-watch-9-axis-sensor-module-study-2\.result\.json$/);
    const file = JSON.parse(readFileSync((await download.path())!, "utf8"));
    expect(file.format).toBe("orthostack.result/1");
    expect(file.trials).toBe(TRIALS);
    expect(file.seed).toBe(424242);
    expect(file.sampling).toBe("lhs");
    expect(file.envelope.inclinationDeg).toBeCloseTo(dip, 3);

    // A worst trial in the 3D view.
    const worst = page.getByRole("table", { name: /^Worst trials of / });
    const firstTrial = (await worst.getByRole("row").nth(1).getByRole("cell").nth(1).innerText()).replace(/,/g, "");
    await worst
      .getByRole("button", { name: /^Open trial \d+ in 3D$/ })
      .first()
      .click();
    const viewer = page.getByRole("dialog", { name: new RegExp(`trial ${Number(firstTrial).toLocaleString("en-US")}`) });
    await viewer.locator("canvas").waitFor({ timeout: 60_000 });
    await page.waitForTimeout(1500);
    await page.screenshot({ path: join(ARTIFACTS, "studies-worst-trial-3d.png") });
    await page.keyboard.press("Escape");
    await viewer.waitFor({ state: "detached" });

    expect(unexpectedProblems(problems)).toEqual([]);
  }, 240_000);

  it("cancels a running study and runs it again", async () => {
    const { page, problems } = await e2e.session();
    await signInAs(page, "engineer@example.com");
    await page.goto(studyUrl);
    await page.getByRole("link", { name: "New study from these settings" }).click();
    const form = page.getByRole("form", { name: "Study settings" });
    await form.getByText("Settings copied from").waitFor();
    await form.getByLabel("Trials", { exact: true }).fill("3000000");
    await form.getByLabel("Label", { exact: true }).fill("Too long: to be cancelled");
    await form.getByRole("button", { name: "Start study" }).click();
    await page.getByRole("heading", { name: /Study 3/, level: 1 }).waitFor();
    const bar = page.getByRole("progressbar", { name: "Study 3 progress" });
    await page.getByText(/^Running: [\d,]+ of 3,000,000 trials$/).waitFor({ timeout: 60_000 });
    await page.getByText(/^about \d/).waitFor({ timeout: 15_000 });
    const before = Number(await bar.getAttribute("aria-valuenow"));
    await page.waitForTimeout(1500);
    expect(Number(await bar.getAttribute("aria-valuenow"))).toBeGreaterThan(before);
    await screenshot(page, "studies-running");

    await page.getByRole("button", { name: "Cancel study" }).click();
    await page.getByText("This study was cancelled before it finished").waitFor();
    await bar.waitFor({ state: "detached" });
    await page.getByRole("button", { name: "Run again" }).click();
    await page.getByRole("progressbar", { name: "Study 3 progress" }).waitFor();
    // Leave the machine free for the next test.
    await page.getByRole("button", { name: "Cancel study" }).click();
    await page.getByText("This study was cancelled before it finished").waitFor();
    expect(unexpectedProblems(problems)).toEqual([]);
  }, 120_000);

  it("a reviewer reads the results but cannot start, cancel or re-run studies", async () => {
    const { page, problems } = await e2e.session();
    await signInAs(page, "reviewer@example.com");
    await openDemoProject(page);
    await page.getByRole("table", { name: "Studies" }).getByRole("link", { name: "Study 2" }).waitFor();
    await expect(page.getByRole("link", { name: "New study" }).count()).resolves.toBe(0);
    await page.goto(studyUrl);
    await page.getByRole("list", { name: "Requirements" }).waitFor();
    await page.getByRole("button", { name: "Download result (JSON)" }).waitFor();
    await expect(page.getByRole("link", { name: "New study from these settings" }).count()).resolves.toBe(0);
    // Study 3 was cancelled: the reviewer sees why it has no result, without a Run again button.
    await page.getByRole("link", { name: "Ridgeline trail watch: 9-axis sensor module" }).click();
    await page.getByRole("table", { name: "Studies" }).getByRole("link", { name: "Study 3" }).click();
    await page.getByText("This study was cancelled before it finished").waitFor();
    await expect(page.getByRole("button", { name: "Run again" }).count()).resolves.toBe(0);
    expect(unexpectedProblems(problems)).toEqual([]);
  }, 60_000);

  it("compares two studies, and runs one study's settings on the draft revision", async () => {
    const { page, problems } = await e2e.session();
    await signInAs(page, "engineer@example.com");
    await openDemoProject(page);
    await page.getByRole("link", { name: "Compare two" }).click();
    await page.getByRole("heading", { name: "Compare studies", level: 1 }).waitFor();
    // Study 1 (the demo's) against study 2 (this file's): their settings differ.
    const a = page.getByRole("combobox", { name: "Study A" });
    const b = page.getByRole("combobox", { name: "Study B" });
    const option = async (select: typeof a, n: number) =>
      (await select.locator("option").allInnerTexts()).find((t) => t.startsWith(`Study ${n} `))!;
    await a.selectOption({ label: await option(a, 1) });
    await b.selectOption({ label: await option(b, 2) });
    const settings = page.getByRole("table", { name: "Settings compared" });
    await settings.getByRole("row", { name: /Seed.*differs/ }).waitFor();
    await settings.getByRole("row", { name: /Field dip.*differs/ }).waitFor();
    await page.getByRole("table", { name: "Requirements compared" }).getByText("heading.maxAbsDeg", { exact: false }).waitFor();
    const envelopes = await drawn(page, '[data-chart="envelope"]');
    expect(envelopes).toHaveLength(5);
    // A and B overlaid: two bands and two median lines in each panel.
    for (const e of envelopes) {
      expect(e.areas).toBe(2);
      expect(e.lines).toBe(2);
    }
    await screenshot(page, "studies-compare");

    // The same settings, seed and requirements on revision 2 (the draft with film attach under the magnetometer).
    await b.selectOption("");
    await a.selectOption({ label: await option(a, 2) });
    const target = page.getByRole("combobox", { name: "Revision to run on" });
    await target.selectOption({ label: (await target.locator("option").allInnerTexts()).find((t) => t.startsWith("Revision 2"))! });
    await page.getByRole("button", { name: "Run these settings on revision 2" }).click();
    await page.waitForURL((url) => url.searchParams.has("b"));
    await page.getByRole("table", { name: "Requirements compared" }).waitFor({ timeout: 120_000 });
    const tolerances = page.getByRole("table", { name: "Tolerances that differ" });
    await tolerances.getByText("mag.bondLine").waitFor();
    const rows = page.getByRole("table", { name: "Settings compared" }).getByRole("row", { name: /differs/ });
    await expect(rows.allInnerTexts()).resolves.toEqual([expect.stringMatching(/^Stack revision/)]);
    await page.getByRole("radio", { name: "All metrics" }).click();
    await screenshot(page, "studies-compare-revisions");
    expect(unexpectedProblems(problems)).toEqual([]);
  }, 180_000);
});
