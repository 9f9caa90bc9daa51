// Server mode (DATABASE_URL): sweeps and allocations through the pg-boss job queue, run by
// worker processes, not by the app. Runs in the "backend-pg" project, which has a real
// PostgreSQL server; under PGlite (project "backend") there is no job queue to test.
import { spawn, type ChildProcess } from "node:child_process";
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import type PgBoss from "pg-boss";
import type { DatabaseHandle } from "@backend/db/client";
import { whatIfRuns } from "@backend/db/schema";
import { JobStudyQueue, openJobQueue, queueStatus, StudyJobWorker, type JobQueueSettings } from "@backend/services/study-jobs";
import { JobWhatIfQueue } from "@backend/services/what-if-jobs";
import { runStudy } from "@shared/engine/study";
import { validateStackFile } from "@shared/schemas/stack-file";
import { validateStudy } from "@shared/schemas/study-file";
import { withTolerances } from "@shared/whatif/parameters";
import { startTestApp, type TestApp } from "./harness";
import { openTestDatabase, testPostgresUrl } from "./test-database";
import { sweepResultOf } from "@backend/services/what-if-runs";

const fixture = (name: string) => JSON.parse(readFileSync(new URL(`../fixtures/${name}`, import.meta.url), "utf8"));
const stack = fixture("stack-reference.json");
const root = fileURLToPath(new URL("../..", import.meta.url));
const STUDY = { ...fixture("study-reference.json"), trials: 12_000, seed: 31 };

async function until<T>(fn: () => Promise<T>, ok: (v: T) => boolean, ms = 120_000): Promise<T> {
  const end = Date.now() + ms;
  for (;;) {
    const v = await fn();
    if (ok(v)) return v;
    if (Date.now() > end) throw new Error(`timed out; last value ${JSON.stringify(v).slice(0, 300)}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

describe.skipIf(!testPostgresUrl())("server mode: what-if runs through the job queue", () => {
  // an expiry short enough that a killed worker's run comes back within the test
  const settings: JobQueueSettings = { expireSeconds: 20, whatIfExpireSeconds: 20, maintenanceSeconds: 1, pollSeconds: 0.5 };
  const log = () => undefined;
  let handle: DatabaseHandle;
  let boss: PgBoss;
  let t: TestApp;
  let eng: string;
  let revisionId: string;
  const workers: StudyJobWorker[] = [];
  let child: ChildProcess | undefined;

  beforeAll(async () => {
    handle = await openTestDatabase();
    boss = await openJobQueue(handle.url!, settings, log);
    t = await startTestApp({
      handle,
      scheduler: new JobStudyQueue(handle.db, boss, log, settings),
      whatIfScheduler: new JobWhatIfQueue(handle.db, boss, log, settings.whatIfExpireSeconds),
      queueStatus: () => queueStatus(handle.db, boss),
    });
    eng = await t.signIn("engineer@example.com");
    const p = await t.call("POST", "/api/projects", { cookie: eng, body: { name: "Server mode what-if" } });
    const rev = await t.call("POST", `/api/projects/${p.body.id}/revisions`, { cookie: eng, body: { stack } });
    revisionId = rev.body.id;
  });

  afterAll(async () => {
    child?.kill("SIGKILL");
    for (const w of workers) await w.stop();
    await t?.close();
    await boss?.stop({ graceful: false, close: true, wait: true });
    await handle?.close();
  });

  const sweep = async (trials: number, values: number[]) => {
    const s = await t.call("POST", `/api/revisions/${revisionId}/sweeps`, {
      cookie: eng,
      body: { study: { ...STUDY, trials }, parameter: "mag.axis", values },
    });
    expect(s.status, JSON.stringify(s.body)).toBe(202);
    return s.body.id as string;
  };
  const row = async (id: string) => (await handle.db.select().from(whatIfRuns).where(eq(whatIfRuns.id, id)))[0];
  const startWorker = async (threads: number) => {
    const w = new StudyJobWorker(handle.db, boss, log, { threads, settings });
    await w.start();
    workers.push(w);
    return w;
  };

  it("the app only queues a sweep; a worker runs it, and its point at today's value is the engine's study", async () => {
    const id = await sweep(STUDY.trials, [0.3, 0.6, 0.9]);
    // no worker yet: the run waits on the job queue, the app's own engine pool does nothing
    const h = await until(
      () => t.call("GET", "/api/health"),
      (x) => x.body.queue.depth >= 1,
    );
    expect(h.body.queue.depth).toBe(1);
    await new Promise((r) => setTimeout(r, 1000));
    expect((await row(id)).status).toBe("queued");
    expect(t.deps.enginePool.activeStudies).toBe(0);

    const w = await startWorker(2);
    const done = await until(
      () => t.call("GET", `/api/sweeps/${id}`, { cookie: eng }),
      (r) => !["queued", "running"].includes(r.body.status),
    );
    expect(done.body.status, done.body.error).toBe("finished");
    expect(done.body.progress).toEqual({ done: 3 * STUDY.trials, total: 3 * STUDY.trials });
    expect(t.deps.enginePool.activeStudies).toBe(0);

    // the point at today's tolerance (0.6 in the reference stack) against the in-thread engine
    const s = validateStackFile(stack);
    if (!s.ok) throw new Error("stack");
    const st = validateStudy(STUDY, s.stack);
    if (!st.ok) throw new Error("study");
    expect(done.body.current).toBe(0.6);
    const engine = runStudy(withTolerances(s.stack, { "mag.axis": 0.6 }), st.study);
    const today = done.body.points.find((p: { value: number }) => p.value === 0.6);
    expect(today.requirements.length).toBe(engine.requirements.length);
    today.requirements.forEach((r: { predictedYield: number; ci: number[]; passes: boolean }, i: number) => {
      expect(r.predictedYield).toBe(engine.requirements[i].predictedYield);
      expect(r.ci).toEqual(engine.requirements[i].ci);
      expect(r.passes).toBe(engine.requirements[i].passes);
    });
    await w.stop();
    workers.splice(workers.indexOf(w), 1);
  });

  it("cancel reaches a run on a worker: it stops there and stays cancelled", async () => {
    const w = await startWorker(1);
    const id = await sweep(300_000, [0.2, 0.4, 0.6, 0.8, 1.0, 1.2]);
    await until(
      () => row(id),
      (r) => r.status === "running" && r.progressDone > 0,
    );
    const c = await t.call("POST", `/api/sweeps/${id}/cancel`, { cookie: eng, body: {} });
    expect(c.status, JSON.stringify(c.body)).toBe(200);
    expect(c.body.status).toBe("cancelled");
    // the worker sees it at its next progress write and lets the job go
    await until(
      () => queueStatus(handle.db, boss),
      (q) => q.depth === 0 && q.active === 0,
    );
    const after = await row(id);
    await new Promise((r) => setTimeout(r, 1500));
    const later = await row(id);
    expect(later.status).toBe("cancelled");
    expect(later.progressDone).toBe(after.progressDone);
    expect(later.progressDone).toBeLessThan(6 * 300_000);
    await w.stop();
    workers.splice(workers.indexOf(w), 1);
  });

  it(
    "a worker process killed mid-run: the job expires, another worker runs it again to the same result",
    { timeout: 300_000 },
    async () => {
      const values = [0.3, 0.6, 0.9, 1.2];
      const trials = 60_000;
      child = spawn(process.execPath, ["--import", "tsx", "backend/worker.ts"], {
        cwd: root,
        env: {
          ...process.env,
          DATABASE_URL: handle.url,
          WORKER_THREADS: "1",
          WHAT_IF_JOB_EXPIRE_SECONDS: "20",
          QUEUE_MAINTENANCE_SECONDS: "1",
          NODE_ENV: "test",
        },
        stdio: "ignore",
      });
      const id = await sweep(trials, values);
      // kill -9 once it has stored a point and is on the next
      await until(
        () => row(id),
        (r) => r.status === "running" && (sweepResultOf(r.result)?.points ?? []).length >= 1,
        180_000,
      );
      child.kill("SIGKILL");
      expect((await row(id)).status).toBe("running");

      await startWorker(2);
      const done = await until(
        () => t.call("GET", `/api/sweeps/${id}`, { cookie: eng }),
        (r) => !["queued", "running"].includes(r.body.status),
        240_000,
      );
      expect(done.body.status, done.body.error).toBe("finished");
      // progress counts the run once (the second worker started it over)
      expect(done.body.progress).toEqual({ done: values.length * trials, total: values.length * trials });
      expect(done.body.points.map((p: { value: number }) => p.value)).toEqual(values);
      // the same sweep run alone by one worker gives the same points, number for number
      const again = await sweep(trials, values);
      const second = await until(
        () => t.call("GET", `/api/sweeps/${again}`, { cookie: eng }),
        (r) => !["queued", "running"].includes(r.body.status),
        240_000,
      );
      expect(second.body.points).toEqual(done.body.points);
    },
  );
});
