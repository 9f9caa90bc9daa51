/**
 * Issue 10, item 1: no account is created except by accepting an invitation, whatever the
 * request path looks like. better-auth normalises paths itself, so a guard on the literal path
 * was not enough; sign-up is now off in better-auth.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { users } from "@backend/db/schema";
import { startTestApp, type TestApp } from "../harness";
import { rawRequest } from "./raw-http";

let t: TestApp;
let admin: string;

beforeAll(async () => {
  t = await startTestApp();
  admin = await t.signIn("admin@example.com");
});
afterAll(async () => t?.close());

const SPELLINGS = [
  "/api/auth/sign-up/email",
  "/api/auth/./sign-up/email",
  "/api/auth/x/../sign-up/email",
  "/api/auth/%2e/sign-up/email",
  "/api/auth/%2E%2E/auth/sign-up/email",
  "/api/auth/x/%2e%2e/sign-up/email",
  "/api/auth//sign-up/email",
  "/api/auth/sign-up//email",
  "/api/auth/sign-up/email/",
  "/api/auth/sign-up/email?x=1",
  "/api/auth/sign-up/email/?callbackURL=/",
  "/api/auth/sign-up%2Femail",
  "/api/auth/Sign-Up/Email",
  "/api//auth/sign-up/email",
  "/api/./auth/sign-up/email",
];

async function userCount(email: string) {
  return (await t.handle.db.select({ id: users.id }).from(users).where(eq(users.email, email))).length;
}

describe("sign-up is closed in better-auth itself", () => {
  it.each(SPELLINGS)("POST %s creates no account", async (path) => {
    const email = `outsider-${SPELLINGS.indexOf(path)}@example.com`;
    const res = await rawRequest(t.url, "POST", path, {
      headers: { "content-type": "application/json", origin: t.deps.baseURL },
      body: JSON.stringify({ email, password: "0123456789abc", name: "Outsider" }),
    });
    expect(res.status, res.body).toBeGreaterThanOrEqual(400);
    expect(await userCount(email)).toBe(0);
  });

  it("an outsider cannot take a pending invitee's address; the invitee still joins", async () => {
    const email = "pending-invitee@example.com";
    const inv = await t.call("POST", "/api/invitations", { cookie: admin, body: { email, role: "engineer" } });
    expect(inv.status).toBe(201);
    for (const path of SPELLINGS) {
      await rawRequest(t.url, "POST", path, {
        headers: { "content-type": "application/json", origin: t.deps.baseURL },
        body: JSON.stringify({ email, password: "attacker-password-1", name: "Attacker" }),
      });
    }
    expect(await userCount(email)).toBe(0);
    const token = String(inv.body.link).split("/invite/")[1];
    const accept = await t.call("POST", `/api/invitations/by-token/${token}/accept`, {
      body: { name: "Rightful Invitee", password: "invitee-password-1" },
    });
    expect(accept.status).toBe(200);
    const cookie = accept.headers
      .getSetCookie()
      .map((c) => c.split(";")[0])
      .join("; ");
    const me = await t.call("GET", "/api/me", { cookie });
    expect(me.status).toBe(200);
    expect(me.body.user.email).toBe(email);
    expect(me.body.role).toBe("engineer");
    // the attacker's password does not open the account
    const bad = await fetch(`${t.url}/api/auth/sign-in/email`, {
      method: "POST",
      headers: { "content-type": "application/json", origin: t.deps.baseURL },
      body: JSON.stringify({ email, password: "attacker-password-1" }),
    });
    expect(bad.status).toBe(401);
    await t.signIn(email, "invitee-password-1");
  });

  it("an invitation accepts once: a second accept with the same token creates nothing", async () => {
    const email = "once@example.com";
    const inv = await t.call("POST", "/api/invitations", { cookie: admin, body: { email, role: "reviewer" } });
    const token = String(inv.body.link).split("/invite/")[1];
    const [a, b] = await Promise.all([
      t.call("POST", `/api/invitations/by-token/${token}/accept`, { body: { name: "Once", password: "once-password-1" } }),
      t.call("POST", `/api/invitations/by-token/${token}/accept`, { body: { name: "Twice", password: "twice-password-1" } }),
    ]);
    expect([a.status, b.status].filter((s) => s === 200)).toHaveLength(1);
    // the other is refused in words (used link, or in use this instant), never a 500
    const other = a.status === 200 ? b : a;
    expect([404, 409]).toContain(other.status);
    expect(["invitation_invalid", "invitation_in_use"]).toContain(other.body.error.code);
    expect(await userCount(email)).toBe(1);
  });
});
