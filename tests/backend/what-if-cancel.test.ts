/**
 * Cancelling a what-if run through the API (one machine: the in-process queue on the warm pool):
 * a running sweep stops (no further point is stored, the pool's threads are free for an
 * ordinary study right after), a queued allocation never starts, the state reads "cancelled"
 * with its activity record, and a run that has ended answers 409.
 */
import { readFileSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { activities, whatIfRuns } from "@backend/db/schema";
import { startTestApp, type TestApp } from "./harness";
import { sweepResultOf } from "@backend/services/what-if-runs";

const fixture = (name: string) => JSON.parse(readFileSync(new URL(`../fixtures/${name}`, import.meta.url), "utf8"));
// many trials per point, so the sweep is still running when it is cancelled
const STUDY = { ...fixture("study-reference.json"), trials: 400_000, seed: 7 };
const VALUES = [0.2, 0.4, 0.6, 0.8, 1.0, 1.2];

let t: TestApp;
let eng: string;
let reviewer: string;
let revisionId: string;

beforeAll(async () => {
  t = await startTestApp();
  eng = await t.signIn("engineer@example.com");
  reviewer = await t.signIn("reviewer@example.com");
  const p = await t.call("POST", "/api/projects", { cookie: eng, body: { name: "what-if cancel" } });
  const rev = await t.call("POST", `/api/projects/${p.body.id}/revisions`, {
    cookie: eng,
    body: { stack: fixture("stack-reference.json") },
  });
  expect(rev.status).toBe(201);
  revisionId = rev.body.id;
});
afterAll(() => t?.close());

async function until(path: string, ok: (body: any) => boolean, seconds = 120) {
  const end = Date.now() + seconds * 1000;
  for (;;) {
    const r = await t.call("GET", path, { cookie: eng });
    expect(r.status, JSON.stringify(r.body)).toBe(200);
    if (ok(r.body)) return r.body;
    if (Date.now() > end) throw new Error(`${path}: timed out at ${JSON.stringify({ status: r.body.status, progress: r.body.progress })}`);
    await new Promise((res) => setTimeout(res, 100));
  }
}

describe("cancelling a what-if run", () => {
  it("stops a running sweep: the state is cancelled, nothing more is written, the pool is free again", async () => {
    const s = await t.call("POST", `/api/revisions/${revisionId}/sweeps`, {
      cookie: eng,
      body: { study: STUDY, parameter: "mag.axis", values: VALUES },
    });
    expect(s.status).toBe(202);
    const id = s.body.id as string;
    await until(`/api/sweeps/${id}`, (b) => b.status === "running" && b.progress.done > 0);

    // a reviewer may read the run but not stop it
    const denied = await t.call("POST", `/api/sweeps/${id}/cancel`, { cookie: reviewer, body: {} });
    expect(denied.status).toBe(403);

    const c = await t.call("POST", `/api/sweeps/${id}/cancel`, { cookie: eng, body: {} });
    expect(c.status, JSON.stringify(c.body)).toBe(200);
    expect(c.body.status).toBe("cancelled");
    expect(c.body.finishedAt).not.toBeNull();
    // the cancel answers once the pool has dropped the sweep's study (no other study is running)
    expect(t.deps.enginePool.activeStudies).toBe(0);
    const at = c.body.progress.done as number;
    expect(at).toBeLessThan(VALUES.length * STUDY.trials);

    // the pool's studies for the sweep were abandoned: an ordinary study runs alone and finishes,
    // and the sweep's row does not move on meanwhile
    const study = await t.call("POST", `/api/revisions/${revisionId}/studies`, {
      cookie: eng,
      body: { study: { ...STUDY, trials: 20_000 } },
    });
    expect(study.status).toBe(202);
    await until(`/api/studies/${study.body.id}`, (b) => b.status === "finished");
    const [row] = await t.handle.db.select().from(whatIfRuns).where(eq(whatIfRuns.id, id));
    expect(row.status).toBe("cancelled");
    expect(row.progressDone).toBe(at);
    expect((sweepResultOf(row.result)?.points ?? []).length).toBe(c.body.points.length);

    const acts = await t.handle.db.select().from(activities).where(eq(activities.action, "whatif.sweep.cancelled"));
    expect(acts.map((a) => (a.data as { runId: string }).runId)).toContain(id);

    // once ended, it cannot be cancelled again
    const again = await t.call("POST", `/api/sweeps/${id}/cancel`, { cookie: eng, body: {} });
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe("invalid_state");
  }, 240_000);

  it("a queued allocation is cancelled before it starts; a sweep id is not an allocation", async () => {
    // two sweeps fill the queue's two places; the allocation behind them waits
    const busy: string[] = [];
    for (let i = 0; i < 2; i++) {
      const s = await t.call("POST", `/api/revisions/${revisionId}/sweeps`, {
        cookie: eng,
        body: { study: STUDY, parameter: "mag.axis", values: VALUES },
      });
      busy.push(s.body.id);
    }
    const a = await t.call("POST", `/api/revisions/${revisionId}/allocations`, { cookie: eng, body: { study: STUDY } });
    expect(a.status).toBe(202);
    await until(`/api/sweeps/${busy[1]}`, (b) => b.status === "running");
    expect((await t.call("GET", `/api/allocations/${a.body.id}`, { cookie: eng })).body.status).toBe("queued");

    expect((await t.call("POST", `/api/sweeps/${a.body.id}/cancel`, { cookie: eng, body: {} })).status).toBe(404);
    const c = await t.call("POST", `/api/allocations/${a.body.id}/cancel`, { cookie: eng, body: {} });
    expect(c.status, JSON.stringify(c.body)).toBe(200);
    expect(c.body.status).toBe("cancelled");
    for (const id of busy) expect((await t.call("POST", `/api/sweeps/${id}/cancel`, { cookie: eng, body: {} })).status).toBe(200);

    // the queue moves on without starting it
    await new Promise((r) => setTimeout(r, 500));
    const [row] = await t.handle.db.select().from(whatIfRuns).where(eq(whatIfRuns.id, a.body.id));
    expect(row.status).toBe("cancelled");
    expect(row.startedAt).toBeNull();
    expect(row.progressDone).toBe(0);
  }, 240_000);
});
