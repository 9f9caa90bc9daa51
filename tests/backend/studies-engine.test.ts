import { execFileSync } from "node:child_process";
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, expect, it } from "vitest";
import { startTestApp, type TestApp } from "./harness";

const fixturePath = (name: string) => new URL(`../fixtures/${name}`, import.meta.url).pathname;
const stack = JSON.parse(readFileSync(fixturePath("stack-reference.json"), "utf8"));
const study = { ...JSON.parse(readFileSync(fixturePath("study-reference.json"), "utf8")), trials: 20_000, seed: 11 };

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp();
});
afterAll(() => t?.close());

async function untilFinished(cookie: string, id: string) {
  const end = Date.now() + 90_000;
  for (;;) {
    const r = await t.call("GET", `/api/studies/${id}`, { cookie });
    if (!["queued", "running"].includes(r.body.status)) return r;
    if (Date.now() > end) throw new Error("study did not finish");
    await new Promise((res) => setTimeout(res, 100));
  }
}

it("a study through the API gives the command-line runner's result for the same files and seed", async () => {
  const eng = await t.signIn("engineer@example.com");
  const p = await t.call("POST", "/api/projects", { cookie: eng, body: { name: "engine end to end" } });
  const rev = await t.call("POST", `/api/projects/${p.body.id}/revisions`, { cookie: eng, body: { stack } });
  const s = await t.call("POST", `/api/revisions/${rev.body.id}/studies`, { cookie: eng, body: { study } });
  expect(s.status).toBe(202);
  const done = await untilFinished(eng, s.body.id);
  expect(done.body.status).toBe("finished");
  expect(done.body.progress.done).toBe(20_000);

  const dir = mkdtempSync(join(tmpdir(), "orthostack-cli-"));
  writeFileSync(join(dir, "study.json"), JSON.stringify(study));
  execFileSync(
    "npx",
    [
      "tsx",
      "backend/cli/study.ts",
      fixturePath("stack-reference.json"),
      join(dir, "study.json"),
      "--out",
      join(dir, "result.json"),
      "--threads",
      "1",
    ],
    {
      stdio: "pipe",
    },
  );
  const cli = JSON.parse(readFileSync(join(dir, "result.json"), "utf8"));
  const api = done.body.result;
  expect(api.trials).toBe(cli.trials);
  expect(api.metrics).toEqual(cli.metrics);
  expect(api.requirements).toEqual(cli.requirements);
  expect(api.histograms).toEqual(cli.histograms);
  expect(api.worstTrials).toEqual(cli.worstTrials);
});
