/**
 * Issue 15 item 4: a session resolved a moment ago is answered from the in-process cache, and
 * every write still takes effect at once for the server's role checks.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { SessionCache } from "@backend/middleware/session-cache";
import type { Actor } from "@backend/middleware/session";
import { memberIdOf, startTestApp, throughSessionCache, type TestApp } from "./harness";

const actor = (role: Actor["role"]): Actor => ({
  userId: "u1",
  name: "N",
  email: "n@example.com",
  memberId: "m1",
  role,
  workspaceId: "w1",
  workspaceName: "W",
  supplierId: null,
});

describe("SessionCache", () => {
  it("keeps an entry for its time and never past the session's end", () => {
    let now = 1_000_000;
    const c = new SessionCache(30_000, 10, () => now);
    c.set("a", actor("engineer"), new Date(now + 60_000), c.generation);
    c.set("b", actor("engineer"), new Date(now + 5_000), c.generation);
    now += 6_000;
    expect(c.get("a")?.role).toBe("engineer");
    expect(c.get("b")).toBeUndefined(); // the session ended first
    now += 25_000;
    expect(c.get("a")).toBeUndefined();
  });

  it("does not store a lookup that began before a write", () => {
    const c = new SessionCache(30_000);
    const before = c.generation;
    c.clear(); // a write started (or ended) while the lookup ran
    c.set("a", actor("admin"), new Date(Date.now() + 60_000), before);
    expect(c.get("a")).toBeUndefined();
  });

  it("suspended, answers and keeps nothing; resumed, begins empty", () => {
    const c = new SessionCache(30_000);
    const end = new Date(Date.now() + 60_000);
    c.set("a", actor("admin"), end, c.generation);
    c.suspend();
    expect(c.get("a")).toBeUndefined();
    c.set("b", actor("admin"), end, c.generation);
    c.resume();
    expect([c.get("a"), c.get("b")]).toEqual([undefined, undefined]);
    c.set("c", actor("admin"), end, c.generation);
    expect(c.get("c")?.role).toBe("admin");
  });

  it("tells its listener once after each write request, never after a read", () => {
    const c = new SessionCache(30_000);
    let told = 0;
    c.afterWrites(() => told++);
    const request = (method: string) => throughSessionCache(c, method);
    request("GET");
    request("HEAD");
    expect(told).toBe(0);
    request("POST");
    request("DELETE");
    expect(told).toBe(2);
  });

  it("holds at most its bound, dropping the oldest", () => {
    const c = new SessionCache(30_000, 2);
    const end = new Date(Date.now() + 60_000);
    c.set("a", actor("admin"), end, c.generation);
    c.set("b", actor("admin"), end, c.generation);
    c.set("c", actor("admin"), end, c.generation);
    expect([c.get("a"), c.get("b"), c.get("c")].map(Boolean)).toEqual([false, true, true]);
  });
});

describe("the session cache in the app", () => {
  let t: TestApp;
  let admin: string;
  beforeAll(async () => {
    t = await startTestApp();
    admin = await t.signIn("admin@example.com");
  });
  afterAll(async () => t?.close());

  it("a role change takes effect on the very next request of a cached session", async () => {
    const engineer = await t.signIn("engineer@example.com");
    // twice: the second read is answered from the cache
    expect((await t.call("GET", "/api/projects", { cookie: engineer })).status).toBe(200);
    expect((await t.call("GET", "/api/me", { cookie: engineer })).body.role).toBe("engineer");
    const memberId = await memberIdOf(t.handle.db, "engineer@example.com");
    const down = await t.call("PATCH", `/api/members/${memberId}`, { cookie: admin, body: { role: "reviewer" } });
    expect(down.status, JSON.stringify(down.body)).toBe(200);
    const create = await t.call("POST", "/api/projects", { cookie: engineer, body: { name: "Not allowed now" } });
    expect(create.status).toBe(403);
    expect((await t.call("GET", "/api/me", { cookie: engineer })).body.role).toBe("reviewer");
    await t.call("PATCH", `/api/members/${memberId}`, { cookie: admin, body: { role: "engineer" } });
    expect((await t.call("GET", "/api/me", { cookie: engineer })).body.role).toBe("engineer");
  });
});
