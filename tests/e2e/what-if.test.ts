/**
 * What if, in a real browser: from a failing study, an engineer sweeps the magnetometer's axis
 * tolerance and reads the curves, maps where the compass holds, and allocates tolerances, then
 * makes a draft from the verified proposal. Runs are kept small: the machine has 2 cores.
 * Screenshots go to tests/e2e/.artifacts/.
 */
import { readFileSync } from "node:fs";
import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { screenshot, signInAs } from "./support/browser";
import { setupE2E, unexpectedProblems } from "./support/setup";

const e2e = setupE2E();
const fixture = (name: string) => JSON.parse(readFileSync(new URL(`../fixtures/${name}`, import.meta.url), "utf8"));
const STACK = fixture("stack-reference.json");
const STUDY = { ...fixture("study-reference.json"), trials: 8_000, seed: 5 };

/** A project, a revision and a finished study through the API, as the signed-in page. */
async function failingStudy(page: Page): Promise<{ projectId: string; studyId: string }> {
  return page.evaluate(
    async ({ stack, study }) => {
      const post = async (path: string, body: unknown) => {
        const r = await fetch(path, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(body) });
        if (!r.ok) throw new Error(`${path}: ${r.status} ${await r.text()}`);
        return r.json();
      };
      const p = await post("/api/projects", { name: "What-if trial" });
      const rev = await post(`/api/projects/${p.id}/revisions`, { stack });
      const s = await post(`/api/revisions/${rev.id}/studies`, { study });
      for (let i = 0; i < 600; i++) {
        const g = await (await fetch(`/api/studies/${s.id}`)).json();
        if (g.status === "finished") return { projectId: p.id as string, studyId: s.id as string };
        if (g.status !== "queued" && g.status !== "running") throw new Error(`study ${g.status}`);
        await new Promise((r) => setTimeout(r, 500));
      }
      throw new Error("study did not finish");
    },
    { stack: STACK, study: STUDY },
  );
}

describe("what if", () => {
  it("from a failing study to an applied, verified draft", async () => {
    const { page, problems } = await e2e.session();
    await signInAs(page, "engineer@example.com");
    const { projectId, studyId } = await failingStudy(page);
    await page.goto(`/projects/${projectId}/studies/${studyId}`);
    await page.getByRole("link", { name: "What if…" }).click();
    await page.getByRole("heading", { name: "What if", level: 1 }).waitFor();

    // sweep: the axis tolerance of the magnetometer, small runs
    await page.getByLabel("Parameter").selectOption("mag.axis");
    await page.getByLabel("Values").fill("0.3, 0.6, 0.9, 1.2");
    await page.getByLabel("Trials per point").fill("4000");
    await page.getByRole("button", { name: "Run the sweep" }).click();
    await page.getByText(/All 4 points done/).waitFor({ timeout: 180_000 });
    const heading = page.getByTestId("crossing-heading.maxAbsDeg");
    const curves = await page.locator("figure svg.recharts-surface").count();
    expect(curves).toBe(STUDY.requirements.length);
    expect(await heading.textContent()).toMatch(/meets its target at 0\.\d+|never meets/);
    await screenshot(page, "what-if-sweep");

    // the map: an inclination sweep through the WMM
    await page.getByRole("radio", { name: "Where the compass holds" }).click();
    await page.getByLabel("Trials per point").fill("1500");
    await page.getByRole("button", { name: "Run the inclination sweep" }).click();
    // the map is drawn once every point is in
    const boundary = page.getByTestId("pass-fail-boundary");
    await boundary.waitFor({ timeout: 300_000 });
    expect(await page.getByRole("progressbar").count()).toBe(0);
    expect((await boundary.getAttribute("d"))?.length ?? 0).toBeGreaterThan(20);
    // the study fails its heading requirement at 60° of inclination: some band fails
    expect(await page.getByRole("list", { name: "Failing latitude bands" }).getByRole("listitem").count()).toBeGreaterThan(0);
    await screenshot(page, "what-if-map");

    // allocation, then a draft from it
    await page.getByRole("radio", { name: "Allocate tolerances" }).click();
    await page.getByLabel("Trials per verifying run").fill("10000");
    await page.getByRole("button", { name: "Find the least-cost tolerances" }).click();
    const create = page.getByRole("button", { name: "Create a draft from this" });
    await create.waitFor({ timeout: 300_000 });
    const table = page.getByRole("table", { name: "Requirements today and with the proposal" });
    expect(await table.getByText("yes, by the interval's lower end").count()).toBe(STUDY.requirements.length);
    await table.scrollIntoViewIfNeeded();
    await screenshot(page, "what-if-allocation");
    await create.click();
    await page.waitForURL(/\/revisions\/[0-9a-f-]{36}$/);
    const note = await page.evaluate(async () => {
      const id = location.pathname.split("/").pop();
      return (await (await fetch(`/api/revisions/${id}`)).json()).note as string;
    });
    expect(note).toMatch(/least-cost allocation/);
    expect(unexpectedProblems(problems)).toEqual([]);
  }, 900_000);
});
