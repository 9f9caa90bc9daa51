/**
 * Issue 10, item 9: people and sessions. Removing a member ends their sessions at once and the
 * address can be invited again; a password change ends the other sessions; an admin sends a
 * reset link through the mail path; names set through the auth routes are limited; accepting
 * invitations is rate limited; a reset cannot be requested from outside.
 */
import { allowConsoleErrors } from "../../setup/logged-errors";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { eq } from "drizzle-orm";
import { outboxMessages, users } from "@backend/db/schema";
import { memberIdOf as harnessMemberIdOf, startTestApp, type TestApp } from "../harness";

let t: TestApp;
let admin: string;

beforeAll(async () => {
  t = await startTestApp();
  admin = await t.signIn("admin@example.com");
});
afterAll(async () => t?.close());

const cookieOf = (headers: Headers) =>
  headers
    .getSetCookie()
    .map((c) => c.split(";")[0])
    .join("; ");

/** Invites the address as an engineer and accepts with the password; returns the session cookie. */
async function join(email: string, password: string, name = "New Person") {
  const inv = await t.call("POST", "/api/invitations", { cookie: admin, body: { email, role: "engineer" } });
  expect(inv.status, JSON.stringify(inv.body)).toBe(201);
  const token = String(inv.body.link).split("/invite/")[1];
  const acc = await t.call("POST", `/api/invitations/by-token/${token}/accept`, { body: { name, password } });
  expect(acc.status, JSON.stringify(acc.body)).toBe(200);
  return cookieOf(acc.headers);
}

const memberIdOf = (email: string) => harnessMemberIdOf(t.handle.db, email);

const me = (cookie: string) => t.call("GET", "/api/me", { cookie });

describe("people and sessions", () => {
  it("removing a member ends their sessions at once, and the address can be invited again", async () => {
    const email = "leaver@example.com";
    const first = await join(email, "first-password-1");
    const second = await t.signIn(email, "first-password-1");
    expect((await me(first)).status).toBe(200);

    const del = await t.call("DELETE", `/api/members/${await memberIdOf(email)}`, { cookie: admin });
    expect(del.status).toBe(204);
    expect((await me(first)).status).toBe(401);
    expect((await me(second)).status).toBe(401);

    // invited again later: the same account (its history kept) with the new name and password
    const [before] = await t.handle.db.select({ id: users.id }).from(users).where(eq(users.email, email));
    const back = await join(email, "second-password-2", "Returning Person");
    const mine = await me(back);
    expect(mine.status).toBe(200);
    expect(mine.body.user.id).toBe(before.id);
    expect(mine.body.user.name).toBe("Returning Person");
    await expect(t.signIn(email, "first-password-1")).rejects.toThrow(/401/);
  });

  it("a member cannot be invited twice while they are one", async () => {
    const res = await t.call("POST", "/api/invitations", { cookie: admin, body: { email: "engineer@example.com", role: "engineer" } });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe("already_member");
  });

  it("changing one's password ends the other sessions, even when the client asks to keep them", async () => {
    const email = "changer@example.com";
    const here = await join(email, "old-password-11");
    const elsewhere = await t.signIn(email, "old-password-11");
    const res = await t.call("POST", "/api/auth/change-password", {
      cookie: here,
      body: { currentPassword: "old-password-11", newPassword: "new-password-22", revokeOtherSessions: false },
    });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect((await me(elsewhere)).status).toBe(401);
    const renewed = cookieOf(res.headers);
    expect((await me(renewed)).status).toBe(200);
    await expect(t.signIn(email, "new-password-22")).resolves.toBeTruthy();
  });

  it("an admin sends a reset link by mail; using it sets the password once and ends every session", async () => {
    const email = "forgetful@example.com";
    const old = await join(email, "forgotten-pass-1");
    const sent = await t.call("POST", `/api/members/${await memberIdOf(email)}/reset-link`, { cookie: admin });
    expect(sent.status, JSON.stringify(sent.body)).toBe(201);
    expect(sent.body.mailed).toBe(true);
    expect(JSON.stringify(sent.body)).not.toMatch(/token/); // the admin never sees the link

    // the catcher stores what it receives over SMTP a moment later
    const mails = await vi.waitFor(
      async () => {
        const all = await t.handle.db.select().from(outboxMessages);
        const mine = all.filter((m) => m.recipients.includes(email) && /Set a new Orthostack password/.test(m.subject));
        expect(mine).toHaveLength(1);
        return mine;
      },
      { timeout: 15_000, interval: 200 },
    );
    const token = /reset-password\?token=([\w-]+)/.exec(mails[0].text)?.[1];
    expect(token).toBeTruthy();

    const reset = await t.call("POST", "/api/auth/reset-password", { body: { token, newPassword: "remembered-pass-2" } });
    expect(reset.status, JSON.stringify(reset.body)).toBe(200);
    expect((await me(old)).status).toBe(401);
    await expect(t.signIn(email, "remembered-pass-2")).resolves.toBeTruthy();
    const again = await t.call("POST", "/api/auth/reset-password", { body: { token, newPassword: "third-password-3" } });
    expect(again.status).toBe(400);
  });

  it("nobody can ask for a reset link from outside (only an admin sends one)", async () => {
    // better-auth prints why it refuses: no self-service reset is configured, on purpose
    allowConsoleErrors(/Reset password isn't enabled/);
    const res = await t.call("POST", "/api/auth/request-password-reset", { body: { email: "engineer@example.com", redirectTo: "/" } });
    expect(res.status).toBeGreaterThanOrEqual(400);
    const mails = (await t.handle.db.select().from(outboxMessages)).filter((m) => m.recipients.includes("engineer@example.com"));
    expect(mails.filter((m) => /password/i.test(m.subject))).toHaveLength(0);
  });

  it("a name set through the auth routes is limited like every name; other fields are refused", async () => {
    const cookie = await t.signIn("engineer@example.com");
    const long = await t.call("POST", "/api/auth/update-user", { cookie, body: { name: "x".repeat(500) } });
    expect(long.status).toBe(400);
    expect(JSON.stringify(long.body)).toMatch(/name/);
    const image = await t.call("POST", "/api/auth/update-user", { cookie, body: { name: "Eve", image: "http://evil.example/x.png" } });
    expect(image.status).toBe(400);
    const ok = await t.call("POST", "/api/auth/update-user", { cookie, body: { name: "  Erin Engineer  " } });
    expect(ok.status, JSON.stringify(ok.body)).toBe(200);
    expect((await me(cookie)).body.user.name).toBe("Erin Engineer");
  });

  it("accepting invitations is rate limited per client address", async () => {
    const statuses: number[] = [];
    for (let i = 0; i < 14; i++) {
      const res = await t.call("POST", `/api/invitations/by-token/not-a-token-${i}/accept`, {
        body: { name: "X", password: "0123456789ab" },
      });
      statuses.push(res.status);
    }
    const first = statuses.indexOf(429);
    expect(first, statuses.join(",")).toBeGreaterThan(0);
    expect(
      statuses.slice(0, first).every((s) => s >= 400 && s < 500),
      statuses.join(","),
    ).toBe(true);
    expect(
      statuses.slice(first).every((s) => s === 429),
      statuses.join(","),
    ).toBe(true);
  });
});
