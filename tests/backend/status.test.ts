/** Issue 16, item 3: the admin's status page (GET /api/status) on one machine. */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startTestApp, type TestApp } from "./harness";

let t: TestApp;

beforeAll(async () => {
  t = await startTestApp({ keepDemoStudy: true });
});
afterAll(async () => t?.close());

describe("server status", () => {
  it("shows the admin where studies run: this server's threads, the studies waiting or running, no job queue", async () => {
    const admin = await t.signIn("admin@example.com");
    const res = await t.call("GET", "/api/status", { cookie: admin });
    expect(res.status).toBe(200);
    expect(res.body.queue).toBeNull();
    expect(res.body.engine.threads).toBe(t.deps.enginePool.size);
    // the demo seed queues its study; it is waiting, running or done by now, never lost from the count
    const { queued, running } = res.body.studies;
    expect(queued + running).toBeLessThanOrEqual(1);
    expect(Number.isNaN(Date.parse(res.body.startedAt))).toBe(false);
  });

  it("is the admin's alone", async () => {
    for (const email of ["engineer@example.com", "reviewer@example.com", "supplier@example.com"]) {
      const res = await t.call("GET", "/api/status", { cookie: await t.signIn(email) });
      expect(res.status, email).toBe(403);
    }
  });
});
