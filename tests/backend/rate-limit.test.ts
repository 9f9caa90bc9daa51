import { afterAll, beforeAll, expect, it } from "vitest";
import { startTestApp, type TestApp } from "./harness";

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp({ signInPerMinute: 3 });
});
afterAll(() => t?.close());

it("limits sign-in attempts per client, and a forged client-address header does not reset it", async () => {
  const attempt = (headers: Record<string, string> = {}) =>
    t.call("POST", "/api/auth/sign-in/email", { body: { email: "admin@example.com", password: "wrong-password" }, headers });
  const statuses = [];
  for (let i = 0; i < 3; i++) statuses.push((await attempt()).status);
  expect(statuses).toEqual([401, 401, 401]);
  expect((await attempt()).status).toBe(429);
  expect((await attempt({ "x-orthostack-client-ip": "10.9.8.7", "x-forwarded-for": "10.9.8.7" })).status).toBe(429);
});

it("counts per app: a second app in the same process starts with its own counters", async () => {
  // better-auth's own memory store is one map per process; each app now keeps its own
  const other = await startTestApp({ signInPerMinute: 3 });
  try {
    const wrong = { email: "admin@example.com", password: "wrong-password" };
    expect((await t.call("POST", "/api/auth/sign-in/email", { body: wrong })).status).toBe(429);
    expect((await other.call("POST", "/api/auth/sign-in/email", { body: wrong })).status).toBe(401);
  } finally {
    await other.close();
  }
});
