import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sql } from "drizzle-orm";
import { DEMO_SEED_STEPS } from "@backend/demo/steps";
import { seedDemo, DEMO_PROJECT } from "@backend/seed";
import { projects, users, workspaces } from "@backend/db/schema";
import { startTestApp, type TestApp } from "./harness";

let t: TestApp;
const cookies: Record<string, string> = {};

beforeAll(async () => {
  t = await startTestApp();
  for (const role of ["admin", "engineer", "reviewer", "supplier"]) cookies[role] = await t.signIn(`${role}@example.com`);
});
afterAll(() => t?.close());

describe("health, session and me", () => {
  it("answers health without a session", async () => {
    const r = await t.call("GET", "/api/health");
    expect(r.status).toBe(200);
    expect(r.body).toEqual({ status: "ok" });
  });

  it("tells each demo user their role and workspace", async () => {
    for (const role of ["admin", "engineer", "reviewer", "supplier"]) {
      const r = await t.call("GET", "/api/me", { cookie: cookies[role] });
      expect(r.status).toBe(200);
      expect(r.body.role).toBe(role);
      expect(r.body.user.email).toBe(`${role}@example.com`);
      expect(r.body.workspace.name).toBe("Kestrel Wearables");
      expect(r.body.supplierId === null).toBe(role !== "supplier");
    }
  });

  it("refuses a wrong password and answers 401 without a session", async () => {
    const bad = await t.call("POST", "/api/auth/sign-in/email", { body: { email: "admin@example.com", password: "not-the-password" } });
    expect(bad.status).toBe(401);
    const r = await t.call("GET", "/api/me");
    expect(r.status).toBe(401);
    expect(r.body.error.code).toBe("unauthenticated");
  });

  it("signs out: the old cookie no longer works", async () => {
    const cookie = await t.signIn("engineer@example.com");
    expect((await t.call("GET", "/api/me", { cookie })).status).toBe(200);
    const out = await t.call("POST", "/api/auth/sign-out", { cookie, body: {} });
    expect(out.status).toBe(200);
    expect((await t.call("GET", "/api/me", { cookie })).status).toBe(401);
  });

  it("blocks public sign-up: accounts come from invitations", async () => {
    const r = await t.call("POST", "/api/auth/sign-up/email", { body: { email: "x@example.com", password: "0123456789ab", name: "X" } });
    expect(r.status).toBe(400);
    expect(r.body.code).toBe("EMAIL_PASSWORD_SIGN_UP_DISABLED");
  });
});

describe("errors have one shape", () => {
  it("malformed JSON is a 400, not a stack trace", async () => {
    const r = await t.call("POST", "/api/projects", { cookie: cookies.engineer, raw: "{not json" });
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe("malformed_json");
    expect(JSON.stringify(r.body)).not.toMatch(/at \w+ \(|node_modules/);
  });

  it("a body over the limit is refused with 413", async () => {
    const r = await t.call("POST", "/api/projects", { cookie: cookies.engineer, body: { name: "x", description: "a".repeat(3_000_000) } });
    expect(r.status).toBe(413);
    expect(r.body.error.code).toBe("too_large");
  });

  it("a bad field is named", async () => {
    const r = await t.call("POST", "/api/projects", { cookie: cookies.engineer, body: { name: "   " } });
    expect(r.status).toBe(400);
    expect(r.body.error.fields).toEqual([{ path: "name", message: "Project name must not be empty" }]);
  });

  it("a bad id is a 400 naming the parameter; a missing project is a 404", async () => {
    const bad = await t.call("GET", "/api/projects/not-a-uuid", { cookie: cookies.engineer });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields[0].path).toBe("id");
    const missing = await t.call("GET", "/api/projects/00000000-0000-4000-8000-000000000000", { cookie: cookies.engineer });
    expect(missing.status).toBe(404);
    expect(missing.body.error.code).toBe("not_found");
  });

  it("an unknown API route is a JSON 404", async () => {
    const r = await t.call("GET", "/api/nothing-here", { cookie: cookies.admin });
    expect(r.status).toBe(404);
    expect(r.body.error.code).toBe("not_found");
  });

  it("sends security headers", async () => {
    const r = await t.call("GET", "/api/health");
    expect(r.headers.get("x-content-type-options")).toBe("nosniff");
    expect(r.headers.get("x-powered-by")).toBeNull();
  });
});

describe("projects", () => {
  it("lists the demo project and searches by name", async () => {
    const all = await t.call("GET", "/api/projects", { cookie: cookies.reviewer });
    expect(all.body.projects.map((p: { name: string }) => p.name)).toContain(DEMO_PROJECT);
    const hit = await t.call("GET", "/api/projects?q=ridgeline", { cookie: cookies.reviewer });
    expect(hit.body.projects).toHaveLength(1);
    const miss = await t.call("GET", "/api/projects?q=zzz_no_such", { cookie: cookies.reviewer });
    expect(miss.body.projects).toHaveLength(0);
    // LIKE wildcards in the search are literal characters
    const pct = await t.call("GET", "/api/projects?q=%25%25", { cookie: cookies.reviewer });
    expect(pct.body.projects).toHaveLength(0);
  });

  it("creates, renames and deletes, recording activity", async () => {
    const c = await t.call("POST", "/api/projects", { cookie: cookies.engineer, body: { name: "Cycling computer IMU" } });
    expect(c.status).toBe(201);
    expect(c.body.ownerName).toBe("Ezra Lindqvist");
    const id = c.body.id;
    const r = await t.call("PATCH", `/api/projects/${id}`, {
      cookie: cookies.engineer,
      body: { name: "Cycling computer IMU, rev B" },
      headers: { "if-match": c.headers.get("etag")! },
    });
    expect(r.status).toBe(200);
    expect(r.body.name).toBe("Cycling computer IMU, rev B");
    const act = await t.call("GET", `/api/projects/${id}/activity`, { cookie: cookies.reviewer });
    expect(act.body.activity.map((a: { action: string }) => a.action)).toEqual(["project.renamed", "project.created"]);
    const d = await t.call("DELETE", `/api/projects/${id}`, { cookie: cookies.engineer, headers: { "if-match": r.headers.get("etag")! } });
    expect(d.status).toBe(204);
    expect((await t.call("GET", `/api/projects/${id}`, { cookie: cookies.engineer })).status).toBe(404);
  });

  it("keeps workspaces apart", async () => {
    const [other] = await t.handle.db.insert(workspaces).values({ name: "Elsewhere Ltd" }).returning();
    const [p] = await t.handle.db.insert(projects).values({ workspaceId: other.id, name: "Secret" }).returning();
    expect((await t.call("GET", `/api/projects/${p.id}`, { cookie: cookies.admin })).status).toBe(404);
    expect((await t.call("DELETE", `/api/projects/${p.id}`, { cookie: cookies.admin })).status).toBe(404);
  });
});

describe("seed", () => {
  it("is idempotent and leaves a workspace with real data alone", async () => {
    const count = async () => (await t.handle.db.select({ n: sql<number>`count(*)::int` }).from(users))[0].n;
    const before = await count();
    expect(await seedDemo(t.handle.db, t.deps.auth, DEMO_SEED_STEPS)).toBe("skipped");
    expect(await count()).toBe(before);
  });
});

describe("invitations", () => {
  it("an admin invites, the invitee accepts with a password and is signed in with the role", async () => {
    const inv = await t.call("POST", "/api/invitations", {
      cookie: cookies.admin,
      body: { email: "New.Person@Example.com", role: "reviewer" },
    });
    expect(inv.status).toBe(201);
    expect(inv.body.email).toBe("new.person@example.com");
    const token = inv.body.link.split("/invite/")[1];
    const preview = await t.call("GET", `/api/invitations/by-token/${token}`);
    expect(preview.body).toEqual({ email: "new.person@example.com", role: "reviewer", workspaceName: "Kestrel Wearables" });

    const short = await t.call("POST", `/api/invitations/by-token/${token}/accept`, { body: { name: "New Person", password: "short" } });
    expect(short.status).toBe(400);
    expect(short.body.error.fields[0].path).toBe("password");

    const res = await fetch(`${t.url}/api/invitations/by-token/${token}/accept`, {
      method: "POST",
      headers: { "content-type": "application/json", origin: t.deps.baseURL },
      body: JSON.stringify({ name: "New Person", password: "a-long-enough-password" }),
    });
    expect(res.status).toBe(200);
    const cookie = res.headers
      .getSetCookie()
      .map((c) => c.split(";")[0])
      .join("; ");
    const me = await t.call("GET", "/api/me", { cookie });
    expect(me.body.role).toBe("reviewer");
    // the link is single-use
    const again = await t.call("GET", `/api/invitations/by-token/${token}`);
    expect(again.status).toBe(404);
    // the password works for sign-in too
    expect(await t.signIn("new.person@example.com", "a-long-enough-password")).toContain("session");
  });

  it("a supplier invitation needs a supplier company; an existing account cannot be invited", async () => {
    const r = await t.call("POST", "/api/invitations", { cookie: cookies.admin, body: { email: "s2@example.com", role: "supplier" } });
    expect(r.status).toBe(400);
    expect(r.body.error.fields[0].path).toBe("supplierId");
    const dup = await t.call("POST", "/api/invitations", {
      cookie: cookies.admin,
      body: { email: "engineer@example.com", role: "engineer" },
    });
    expect(dup.status).toBe(409);
  });

  it("an invited supplier user becomes a contact of their company, and the admin sees which contacts can sign in", async () => {
    const supplier = (await t.call("GET", "/api/suppliers", { cookie: cookies.admin })).body.suppliers[0];
    const before = supplier.contacts.length;
    const inv = await t.call("POST", "/api/invitations", {
      cookie: cookies.admin,
      body: { email: "Line.Lead@Supplier.example", role: "supplier", supplierId: supplier.id },
    });
    expect(inv.status).toBe(201);
    const token = inv.body.link.split("/invite/")[1];
    const acc = await t.call("POST", `/api/invitations/by-token/${token}/accept`, {
      body: { name: "Line Lead", password: "a-long-enough-password" },
    });
    expect(acc.status).toBe(200);
    const after = (await t.call("GET", `/api/suppliers/${supplier.id}`, { cookie: cookies.admin })).body;
    expect(after.contacts).toHaveLength(before + 1);
    expect(after.contacts.find((c: { email: string }) => c.email === "line.lead@supplier.example")).toMatchObject({
      name: "Line Lead",
      hasAccount: true,
    });
    // a contact typed in by the admin has no account until someone signs up with that address
    const added = await t.call("POST", `/api/suppliers/${supplier.id}/contacts`, {
      cookie: cookies.admin,
      body: { name: "Quality inbox", email: "quality.inbox@supplier.example" },
    });
    expect(added.status).toBeLessThan(300);
    // the answer to the add is a whole contact, as the client parses it
    expect(added.body.hasAccount).toBe(false);
    const listed = (await t.call("GET", `/api/suppliers/${supplier.id}`, { cookie: cookies.admin })).body.contacts;
    expect(listed.find((c: { email: string }) => c.email === "quality.inbox@supplier.example").hasAccount).toBe(false);
  });

  it("a revoked invitation cannot be used", async () => {
    const inv = await t.call("POST", "/api/invitations", { cookie: cookies.admin, body: { email: "gone@example.com", role: "engineer" } });
    expect((await t.call("DELETE", `/api/invitations/${inv.body.id}`, { cookie: cookies.admin })).status).toBe(204);
    const token = inv.body.link.split("/invite/")[1];
    expect((await t.call("GET", `/api/invitations/by-token/${token}`)).status).toBe(404);
  });
});

describe("members and suppliers", () => {
  it("keeps at least one admin and refuses self-removal", async () => {
    const list = await t.call("GET", "/api/members", { cookie: cookies.admin });
    const admin = list.body.members.find((m: { role: string }) => m.role === "admin");
    const demote = await t.call("PATCH", `/api/members/${admin.id}`, { cookie: cookies.admin, body: { role: "engineer" } });
    expect(demote.status).toBe(409);
    expect((await t.call("DELETE", `/api/members/${admin.id}`, { cookie: cookies.admin })).status).toBe(409);
  });

  it("manages supplier companies and contacts; names are unique", async () => {
    const s = await t.call("POST", "/api/suppliers", { cookie: cookies.admin, body: { name: "Brackwater Dies", kind: "die" } });
    expect(s.status).toBe(201);
    const dup = await t.call("POST", "/api/suppliers", { cookie: cookies.admin, body: { name: "brackwater dies" } });
    expect(dup.status).toBe(409);
    const c = await t.call("POST", `/api/suppliers/${s.body.id}/contacts`, {
      cookie: cookies.admin,
      body: { name: "Io", email: "io@brackwater.example" },
    });
    expect(c.status).toBe(201);
    const got = await t.call("GET", `/api/suppliers/${s.body.id}`, { cookie: cookies.engineer });
    expect(got.body.contacts).toEqual([{ id: c.body.id, name: "Io", email: "io@brackwater.example", hasAccount: false }]);
    const bad = await t.call("POST", "/api/suppliers", { cookie: cookies.admin, body: { name: "Y", kind: "bakery" } });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields[0].path).toBe("kind");
  });
});
