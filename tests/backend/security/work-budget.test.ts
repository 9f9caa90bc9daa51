/**
 * Issue 10, item 10: one study cannot starve the others. A 10^7-trial study at a 0.1° heading
 * step took 4.4 h and held every other study in the queue. A study's work (trials × attitudes)
 * now has a budget per workspace: past it, a 400 naming study.trials; an admin may raise it.
 */
import { readFileSync } from "node:fs";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { activities, studies } from "@backend/db/schema";
import { DEFAULT_STUDY_WORK_BUDGET } from "@shared/schemas/studies";
import { startTestApp, type TestApp } from "../harness";

const fixture = (name: string) => JSON.parse(readFileSync(new URL(`../../fixtures/${name}`, import.meta.url), "utf8"));
const STACK = fixture("stack-reference.json");
const STUDY = fixture("study-reference.json");

let t: TestApp;
const c: Record<string, string> = {};
let revisionId: string;

beforeAll(async () => {
  // queued studies wait here: nothing runs
  t = await startTestApp({
    runner: (_i, { signal }) => new Promise((_r, reject) => signal.addEventListener("abort", () => reject(new Error("cancelled")))),
  });
  for (const role of ["admin", "engineer", "reviewer"]) c[role] = await t.signIn(`${role}@example.com`);
  const p = await t.call("POST", "/api/projects", { cookie: c.engineer, body: { name: "Work budget" } });
  const r = await t.call("POST", `/api/projects/${p.body.id}/revisions`, { cookie: c.engineer, body: { stack: STACK } });
  expect(r.status, JSON.stringify(r.body)).toBe(201);
  revisionId = r.body.id;
}, 120_000);
afterAll(async () => t?.close());

const start = (study: Record<string, unknown>, cookie = c.engineer) =>
  t.call("POST", `/api/revisions/${revisionId}/studies`, { cookie, body: { study: { ...STUDY, ...study } } });

describe("the work budget of one study", () => {
  it("the study of the finding (10^7 trials at a 0.1° step: 1.8·10^11) is refused, naming study.trials, and nothing is queued", async () => {
    const before = (await t.handle.db.select().from(studies)).length;
    const r = await start({ trials: 10_000_000, headingStepDeg: 0.1 });
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe("over_budget");
    expect(r.body.error.fields).toEqual([
      {
        path: "study.trials",
        message: expect.stringMatching(/^10,000,000 trials × 18,000 attitudes = 180,000,000,000 is past the work budget of 2,000,000,000/),
      },
    ]);
    expect((await t.handle.db.select().from(studies)).length).toBe(before);
  });

  it("at the budget it is queued; one trial past it, not", async () => {
    // a 1° step: 360 headings × 5 tilts = 1,800 attitudes
    const atBudget = Math.floor(DEFAULT_STUDY_WORK_BUDGET / 1800);
    expect((await start({ trials: atBudget, headingStepDeg: 1 })).status).toBe(202);
    const past = await start({ trials: atBudget + 1, headingStepDeg: 1 });
    expect(past.status).toBe(400);
    expect(past.body.error.fields[0].path).toBe("study.trials");
  });

  it("without a compass sweep, the work is the trials alone", async () => {
    expect((await start({ trials: 10_000_000, heading: false, requirements: [] })).status).toBe(202);
  });

  it("only an admin may raise it; then the study is queued, and the change is recorded", async () => {
    const budget = await t.call("GET", "/api/workspace/study-budget", { cookie: c.engineer });
    expect(budget.status).toBe(200);
    expect(budget.body).toMatchObject({ budget: DEFAULT_STUDY_WORK_BUDGET, defaultBudget: DEFAULT_STUDY_WORK_BUDGET });
    expect((await t.call("PATCH", "/api/workspace/study-budget", { cookie: c.engineer, body: { budget: 2e11 } })).status).toBe(403);
    expect((await t.call("PATCH", "/api/workspace/study-budget", { cookie: c.reviewer, body: { budget: 2e11 } })).status).toBe(403);

    const bad = await t.call("PATCH", "/api/workspace/study-budget", { cookie: c.admin, body: { budget: 1e15 } });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields[0].path).toBe("budget");

    const raised = await t.call("PATCH", "/api/workspace/study-budget", { cookie: c.admin, body: { budget: 200_000_000_000 } });
    expect(raised.status, JSON.stringify(raised.body)).toBe(200);
    expect(raised.body.budget).toBe(200_000_000_000);
    const [logged] = await t.handle.db.select().from(activities).where(eq(activities.action, "workspace.study_budget"));
    expect(logged.summary).toContain("200,000,000,000");
    expect((await start({ trials: 10_000_000, headingStepDeg: 0.1 })).status).toBe(202);
  });

  it("the pace for the estimate is measured from the workspace's finished studies", async () => {
    // only this one counts: any finished study of the seed is set aside
    await t.handle.db.update(studies).set({ status: "cancelled" }).where(eq(studies.status, "finished"));
    const [any] = await t.handle.db.select().from(studies).limit(1);
    // one finished study of 10^5 trials × 180 attitudes that ran 9 s: 2·10^6 trial-attitudes per second
    await t.handle.db
      .update(studies)
      .set({
        status: "finished",
        study: { ...STUDY, trials: 100_000 },
        trialsTotal: 100_000,
        startedAt: new Date("2026-12-01T10:00:00Z"),
        finishedAt: new Date("2026-12-01T10:00:09Z"),
      })
      .where(eq(studies.id, any.id));
    const r = await t.call("GET", "/api/workspace/study-budget", { cookie: c.engineer });
    expect(r.body.measuredStudies).toBe(1);
    expect(r.body.workPerSecond).toBeCloseTo(2e6, 6);
  });
});
