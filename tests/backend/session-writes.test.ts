/**
 * Server mode (issue 15 item 4 with several app processes): each app process keeps its session
 * cache, and a write in one empties the others' through PostgreSQL's LISTEN/NOTIFY
 * (backend/db/session-writes.ts). Runs in the "backend-pg" project; under PGlite there is no
 * second process to tell.
 */
import pg from "pg";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { DatabaseHandle } from "@backend/db/client";
import { SessionWrites } from "@backend/db/session-writes";
import { SessionCache } from "@backend/middleware/session-cache";
import type { Actor } from "@backend/middleware/session";
import { recordServerLog } from "../setup/logged-errors";
import { memberIdOf, startTestApp, throughSessionCache, type TestApp } from "./harness";
import { openTestDatabase, testPostgresUrl } from "./test-database";

const actor: Actor = {
  userId: "u1",
  name: "N",
  email: "n@example.com",
  memberId: "m1",
  role: "engineer",
  workspaceId: "w1",
  workspaceName: "W",
  supplierId: null,
};
const later = () => new Date(Date.now() + 60_000);

async function until(ok: () => boolean | Promise<boolean>, ms = 10_000): Promise<void> {
  const end = Date.now() + ms;
  while (!(await ok())) {
    if (Date.now() > end) throw new Error("timed out");
    await new Promise((r) => setTimeout(r, 20));
  }
}

describe.skipIf(!testPostgresUrl())("session caches of several app processes", () => {
  let handle: DatabaseHandle;
  const channels: SessionWrites[] = [];
  const open = async () => {
    const w = new SessionWrites(handle.url!, handle.db, new SessionCache(30_000), recordServerLog);
    channels.push(w);
    await w.start();
    return w;
  };

  beforeAll(async () => {
    handle = await openTestDatabase({ seeded: true });
  });
  afterAll(async () => {
    for (const w of channels) await w.stop();
    await handle?.close();
  });

  it("a write done in one process empties the other processes' caches", async () => {
    const a = await open(),
      b = await open();
    expect(a.listening && b.listening).toBe(true);
    a.cache.set("k", actor, later(), a.cache.generation);
    b.cache.set("k", actor, later(), b.cache.generation);
    expect(b.cache.get("k")?.role).toBe("engineer");
    throughSessionCache(a.cache, "POST");
    expect(a.cache.get("k")).toBeUndefined(); // its own at once
    await until(() => b.cache.get("k") === undefined);
    // a read does not tell anyone
    b.cache.set("k", actor, later(), b.cache.generation);
    throughSessionCache(a.cache, "GET");
    await new Promise((r) => setTimeout(r, 200));
    expect(b.cache.get("k")?.role).toBe("engineer");
  });

  it("caches nothing before it listens, nor while its connection is lost, and listens again", async () => {
    const cache = new SessionCache(30_000);
    const w = new SessionWrites(handle.url!, handle.db, cache, () => undefined);
    channels.push(w);
    // not started: suspended
    cache.set("k", actor, later(), cache.generation);
    expect(cache.get("k")).toBeUndefined();
    await w.start();
    cache.set("k", actor, later(), cache.generation);
    expect(cache.get("k")?.role).toBe("engineer");
    // the server drops the listening connection (a restart, a network cut)
    const admin = new pg.Client({ connectionString: handle.url });
    await admin.connect();
    try {
      await admin.query("select pg_terminate_backend(pid) from pg_stat_activity where application_name = $1", [
        `orthostack session writes ${w.processId}`,
      ]);
    } finally {
      await admin.end();
    }
    await until(() => cache.isSuspended);
    expect(cache.get("k")).toBeUndefined();
    cache.set("k2", actor, later(), cache.generation);
    expect(cache.get("k2")).toBeUndefined();
    // reopened after a short wait, empty
    await until(() => w.listening && !cache.isSuspended);
    cache.set("k3", actor, later(), cache.generation);
    expect(cache.get("k3")?.role).toBe("engineer");
  });

  describe("two apps on one database", () => {
    let one: TestApp, two: TestApp;
    beforeAll(async () => {
      one = await startTestApp({ handle, sessionCache: (await open()).cache });
      two = await startTestApp({ handle, sessionCache: (await open()).cache });
    });
    afterAll(async () => {
      await one?.close();
      await two?.close();
    });

    it("a role changed through one app holds in the other as soon as the notification arrives", async () => {
      const admin = await one.signIn("admin@example.com");
      const engineer = await two.signIn("engineer@example.com");
      const cache = channels.at(-1)!.cache;
      expect((await two.call("GET", "/api/me", { cookie: engineer })).body.role).toBe("engineer");
      expect(cache.get(engineer)?.role).toBe("engineer"); // the second app answers from its cache
      const memberId = await memberIdOf(handle.db, "engineer@example.com");
      const down = await one.call("PATCH", `/api/members/${memberId}`, { cookie: admin, body: { role: "reviewer" } });
      expect(down.status, JSON.stringify(down.body)).toBe(200);
      await until(() => cache.get(engineer) === undefined, 5_000);
      expect((await two.call("GET", "/api/me", { cookie: engineer })).body.role).toBe("reviewer");
      expect((await two.call("POST", "/api/projects", { cookie: engineer, body: { name: "Not allowed now" } })).status).toBe(403);
      await one.call("PATCH", `/api/members/${memberId}`, { cookie: admin, body: { role: "engineer" } });
    });
  });
});
