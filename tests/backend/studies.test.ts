import { allowServerErrors } from "../setup/logged-errors";
import { readFileSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, eq, sql } from "drizzle-orm";
import type { DatabaseHandle } from "@backend/db/client";
import { openTestDatabase } from "./test-database";
import { activities, projects, studies, studyResults, users } from "@backend/db/schema";
import type { StudyRunner, StudyScheduler } from "@backend/services/study-queue";
import { cancelStudy } from "@backend/services/studies";
import type { Actor } from "@backend/middleware/session";
import type { ResultFile } from "@shared/schemas/result-file";
import { startTestApp, type TestApp } from "./harness";

const fixture = (name: string) => JSON.parse(readFileSync(new URL(`../fixtures/${name}`, import.meta.url), "utf8"));
const stack = fixture("stack-reference.json");
const study = { ...fixture("study-reference.json"), trials: 2000 };

async function until<T>(fn: () => Promise<T>, ok: (v: T) => boolean, ms = 30_000): Promise<T> {
  const end = Date.now() + ms;
  for (;;) {
    const v = await fn();
    if (ok(v)) return v;
    if (Date.now() > end) throw new Error(`timed out; last value ${JSON.stringify(v).slice(0, 300)}`);
    await new Promise((r) => setTimeout(r, 50));
  }
}

/** A result file with the trials and seed of the study and nothing measured: what a stand-in runner answers. */
function emptyResult(trials: number, seed: number): ResultFile {
  return {
    format: "orthostack.result/1",
    engine: "stand-in",
    trials,
    seed,
    sampling: "random",
    stopped: false,
    calibration: "none",
    metrics: {},
    requirements: [],
    ciMethod: "wilson",
    percentileStore: { method: "none", maxRelativeBucketWidth: 0 },
    histograms: {},
    envelope: null,
    contributors: [],
    stackUp: [],
    worstTrials: {},
    convergence: [],
    adaptive: null,
    sources: [],
  };
}

/** A runner that reports progress and waits until told to finish, or is cancelled. */
function controllableRunner() {
  let release: (() => void) | null = null;
  let calls = 0;
  const runner: StudyRunner = (input, { signal, onProgress }) =>
    new Promise((resolve, reject) => {
      calls++;
      const total = Number(input.study.trials);
      onProgress(Math.floor(total / 4), total);
      signal.addEventListener("abort", () => reject(new Error("aborted")));
      release = () =>
        resolve({
          result: emptyResult(total, input.study.seed),
          passes: true,
        });
    });
  return { runner, finish: () => release?.(), calls: () => calls };
}

describe("studies with a controllable runner", () => {
  let t: TestApp;
  let handle: DatabaseHandle;
  let ctl: ReturnType<typeof controllableRunner>;
  const c: Record<string, string> = {};
  let revisionId: string;
  let projectId: string;

  beforeAll(async () => {
    handle = await openTestDatabase();
    ctl = controllableRunner();
    t = await startTestApp({ handle, runner: ctl.runner });
    for (const role of ["admin", "engineer", "reviewer", "supplier"]) c[role] = await t.signIn(`${role}@example.com`);
    const p = await t.call("POST", "/api/projects", { cookie: c.engineer, body: { name: "Study tests" } });
    projectId = p.body.id;
    const rev = await t.call("POST", `/api/projects/${p.body.id}/revisions`, { cookie: c.engineer, body: { stack } });
    revisionId = rev.body.id;
  });
  afterAll(async () => {
    await t?.close();
    await handle?.close();
  });

  it("queues with 202, shows progress while running, and stores the result on finishing", async () => {
    const r = await t.call("POST", `/api/revisions/${revisionId}/studies`, { cookie: c.engineer, body: { study } });
    expect(r.status).toBe(202);
    expect(["queued", "running"]).toContain(r.body.status);
    const running = await until(
      () => t.call("GET", `/api/studies/${r.body.id}`, { cookie: c.reviewer }),
      (x) => x.body.status === "running" && x.body.progress.done > 0,
    );
    expect(running.body.progress).toMatchObject({ done: 500, total: 2000 });
    expect(running.body.result).toBeNull();
    ctl.finish();
    const done = await until(
      () => t.call("GET", `/api/studies/${r.body.id}`, { cookie: c.reviewer }),
      (x) => x.body.status === "finished",
    );
    expect(done.body.result.format).toBe("orthostack.result/1");
    expect(done.body.passes).toBe(true);
    expect(done.body.stack).toEqual(stack);
  });

  it("shows each project's newest study in the projects list, its search and the project itself", async () => {
    const newest = async (query = "") => {
      const r = await t.call("GET", `/api/projects${query}`, { cookie: c.reviewer });
      return r.body.projects.find((p: { id: string }) => p.id === projectId)?.lastStudy;
    };
    const first = await newest();
    expect(first).toMatchObject({ status: "finished", passes: true });
    expect(typeof first.finishedAt).toBe("string");

    const second = await t.call("POST", `/api/revisions/${revisionId}/studies`, { cookie: c.engineer, body: { study } });
    for (const query of ["", "?q=study%20tests", "?archived=all"]) {
      const shown = await newest(query);
      expect(shown.id, query).toBe(second.body.id);
      expect(shown.id).not.toBe(first.id);
      expect(["queued", "running"]).toContain(shown.status);
      expect(shown.passes).toBeNull();
      expect(shown.finishedAt).toBeNull();
    }
    expect((await t.call("GET", `/api/projects/${projectId}`, { cookie: c.reviewer })).body.lastStudy.id).toBe(second.body.id);
    await until(
      () => t.call("GET", `/api/studies/${second.body.id}`, { cookie: c.reviewer }),
      (x) => x.body.status === "running",
    );
    ctl.finish();
    await until(
      () => t.call("GET", `/api/studies/${second.body.id}`, { cookie: c.reviewer }),
      (x) => x.body.status === "finished",
    );
    expect(await newest()).toMatchObject({ id: second.body.id, status: "finished", passes: true });

    const empty = await t.call("POST", `/api/projects`, { cookie: c.engineer, body: { name: "No studies yet" } });
    const listed = await t.call("GET", "/api/projects", { cookie: c.reviewer });
    expect(listed.body.projects.find((p: { id: string }) => p.id === empty.body.id).lastStudy).toBeNull();
    expect(empty.body.lastStudy).toBeNull();
  });

  it("refuses a bad study file with paths and queues nothing", async () => {
    const before = (await handle.db.select({ n: sql<number>`count(*)::int` }).from(studies))[0].n;
    for (const [bad, path] of [
      [{ ...study, trials: 0 }, "study.trials"],
      [{ ...study, requirements: [{ metric: "nope.tiltDeg", max: 1, yield: 0.9 }] }, "study.requirements[0].metric"],
    ] as const) {
      const r = await t.call("POST", `/api/revisions/${revisionId}/studies`, { cookie: c.engineer, body: { study: bad } });
      expect(r.status).toBe(400);
      expect(r.body.error.code).toBe("invalid_study");
      expect(r.body.error.fields.map((f: { path: string }) => f.path)).toContain(path);
    }
    expect((await handle.db.select({ n: sql<number>`count(*)::int` }).from(studies))[0].n).toBe(before);
  });

  it("takes the inclination from a site through the WMM and keeps what it found", async () => {
    const { inclinationDeg: _drop, ...noInclination } = study;
    const r = await t.call("POST", `/api/revisions/${revisionId}/studies`, {
      cookie: c.engineer,
      body: { study: noInclination, site: { latitudeDeg: 80, longitudeDeg: 0, altitudeKm: 0, date: "2025-01-01" } },
    });
    expect(r.status).toBe(202);
    // WMM2025 test value at 80°N 0°E, 2025.0: I = 83.21°
    expect(r.body.study.inclinationDeg).toBeCloseTo(83.21, 2);
    expect(r.body.site.inclinationDeg).toBeCloseTo(83.21, 2);
    await t.call("POST", `/api/studies/${r.body.id}/cancel`, { cookie: c.engineer, body: {} });
  });

  it("cancels a running study", async () => {
    const r = await t.call("POST", `/api/revisions/${revisionId}/studies`, { cookie: c.engineer, body: { study } });
    await until(
      () => t.call("GET", `/api/studies/${r.body.id}`, { cookie: c.engineer }),
      (x) => x.body.status === "running",
    );
    const cancel = await t.call("POST", `/api/studies/${r.body.id}/cancel`, { cookie: c.engineer, body: {} });
    expect(cancel.status).toBe(200);
    expect(cancel.body.status).toBe("cancelled");
    const again = await t.call("POST", `/api/studies/${r.body.id}/cancel`, { cookie: c.engineer, body: {} });
    expect(again.status).toBe(409);
    const none = await handle.db.select().from(studyResults).where(eq(studyResults.studyId, r.body.id));
    expect(none).toHaveLength(0);
  });

  it("roles: reviewers read, suppliers get nothing", async () => {
    expect((await t.call("POST", `/api/revisions/${revisionId}/studies`, { cookie: c.reviewer, body: { study } })).status).toBe(403);
    const list = await t.call(
      "GET",
      `/api/projects/${(await t.call("GET", `/api/revisions/${revisionId}`, { cookie: c.engineer })).body.projectId}/studies`,
      { cookie: c.supplier },
    );
    expect(list.status).toBe(403);
  });
});

describe("faults", () => {
  it("a study that ends just as it is cancelled stays as it ended: 409, and no cancel is recorded", async () => {
    // runs until stopped
    const runner: StudyRunner = (_input, { signal }) =>
      new Promise((_resolve, reject) => signal.addEventListener("abort", () => reject(new Error("stopped"))));
    const t = await startTestApp({ runner });
    try {
      const eng = await t.signIn("engineer@example.com");
      const p = await t.call("POST", "/api/projects", { cookie: eng, body: { name: "late cancel" } });
      const rev = await t.call("POST", `/api/projects/${p.body.id}/revisions`, { cookie: eng, body: { stack } });
      const s = await t.call("POST", `/api/revisions/${rev.body.id}/studies`, { cookie: eng, body: { study } });
      await until(
        () => t.call("GET", `/api/studies/${s.body.id}`, { cookie: eng }),
        (x) => x.body.status === "running",
      );
      // the race: between the cancel's check of the state and the scheduler's cancel, the study
      // finishes (its result transaction lands first); the scheduler then finds nothing to stop
      const lateScheduler: StudyScheduler = {
        start: async () => undefined,
        kick: () => undefined,
        stop: async () => undefined,
        cancel: async (id) => {
          await t.handle.db.update(studies).set({ status: "finished", finishedAt: new Date() }).where(eq(studies.id, id));
          return true;
        },
      };
      const [project] = await t.handle.db.select().from(projects).where(eq(projects.id, p.body.id));
      const [user] = await t.handle.db.select().from(users).where(eq(users.email, "engineer@example.com"));
      const actor = { userId: user.id, workspaceId: project.workspaceId } as Actor;
      await expect(cancelStudy(t.handle.db, lateScheduler, actor, s.body.id)).rejects.toMatchObject({
        status: 409,
        message: expect.stringMatching(/is finished; it ended before the cancel reached it/),
      });
      const recorded = await t.handle.db
        .select()
        .from(activities)
        .where(and(eq(activities.projectId, p.body.id), eq(activities.action, "study.cancelled")));
      expect(recorded).toHaveLength(0);
      expect((await t.call("GET", `/api/studies/${s.body.id}`, { cookie: eng })).body.status).toBe("finished");
    } finally {
      await t.close();
    }
  });

  it("a study that throws is failed with its message, and the server keeps serving", async () => {
    const runner: StudyRunner = async () => {
      throw new Error("the stack has no board");
    };
    // the server logs the failure it was made to have
    allowServerErrors(/the stack has no board/);
    const t = await startTestApp({ runner });
    try {
      const eng = await t.signIn("engineer@example.com");
      const p = await t.call("POST", "/api/projects", { cookie: eng, body: { name: "x" } });
      const rev = await t.call("POST", `/api/projects/${p.body.id}/revisions`, { cookie: eng, body: { stack } });
      const s = await t.call("POST", `/api/revisions/${rev.body.id}/studies`, { cookie: eng, body: { study } });
      const failed = await until(
        () => t.call("GET", `/api/studies/${s.body.id}`, { cookie: eng }),
        (x) => x.body.status === "failed",
      );
      expect(failed.body.error).toBe("the stack has no board");
      expect((await t.call("GET", "/api/health")).status).toBe(200);
    } finally {
      await t.close();
    }
  });

  it("after a stop mid-study the study is interrupted, and it can be run again", async () => {
    const handle = await openTestDatabase();
    const first = controllableRunner();
    const t1 = await startTestApp({ handle, runner: first.runner });
    const eng = await t1.signIn("engineer@example.com");
    const p = await t1.call("POST", "/api/projects", { cookie: eng, body: { name: "restart" } });
    const rev = await t1.call("POST", `/api/projects/${p.body.id}/revisions`, { cookie: eng, body: { stack } });
    const s = await t1.call("POST", `/api/revisions/${rev.body.id}/studies`, { cookie: eng, body: { study } });
    await until(
      () => t1.call("GET", `/api/studies/${s.body.id}`, { cookie: eng }),
      (x) => x.body.status === "running",
    );
    await t1.crash();

    const second = controllableRunner();
    const t2 = await startTestApp({ handle, runner: second.runner, seed: false });
    try {
      const eng2 = await t2.signIn("engineer@example.com");
      const after = await t2.call("GET", `/api/studies/${s.body.id}`, { cookie: eng2 });
      expect(after.body.status).toBe("interrupted");
      expect(after.body.result).toBeNull();
      const rerun = await t2.call("POST", `/api/studies/${s.body.id}/rerun`, { cookie: eng2, body: {} });
      expect(rerun.status).toBe(202);
      await until(
        () => t2.call("GET", `/api/studies/${s.body.id}`, { cookie: eng2 }),
        (x) => x.body.status === "running",
      );
      second.finish();
      const done = await until(
        () => t2.call("GET", `/api/studies/${s.body.id}`, { cookie: eng2 }),
        (x) => x.body.status === "finished",
      );
      expect(done.body.result.trials).toBe(2000);
    } finally {
      await t2.close();
      await handle.close();
    }
  });
});
