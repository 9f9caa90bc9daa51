/**
 * Issue 10, item 2: state-changing requests only from the app's own origin, bodies only as JSON
 * (multipart on upload routes). A form on another port of the same host approved a revision with
 * the reviewer's cookie, and `Origin: http://evil.example` created a project.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { AddressInfo } from "node:net";
import type { Server } from "node:http";
import { eq } from "drizzle-orm";
import { createApp } from "@backend/app";
import { projects, stackRevisions } from "@backend/db/schema";
import { startTestApp, type TestApp } from "../harness";
import { rawRequest } from "./raw-http";

let t: TestApp;
let engineer: string;
let reviewer: string;

beforeAll(async () => {
  t = await startTestApp();
  engineer = await t.signIn("engineer@example.com");
  reviewer = await t.signIn("reviewer@example.com");
});
afterAll(async () => t?.close());

const projectCount = async (name: string) => (await t.handle.db.select().from(projects).where(eq(projects.name, name))).length;

async function createProject(name: string, headers: Record<string, string>, body = JSON.stringify({ name })) {
  return rawRequest(t.url, "POST", "/api/projects", {
    headers: { cookie: engineer, "content-type": "application/json", ...headers },
    body,
  });
}

describe("writes only from the app's own origin", () => {
  it.each([
    ["a foreign site", { origin: "http://evil.example" }],
    ["another port of the same host", { origin: "http://127.0.0.1:1" }],
    ["another port of the app's host name", { origin: "http://localhost:4000" }],
    ["no Origin at all", {}],
    ["an opaque origin", { origin: "null" }],
    ["the right origin but a cross-site fetch", { origin: "http://localhost:3999", "sec-fetch-site": "cross-site" }],
    ["the right origin but a same-site fetch from another port", { origin: "http://localhost:3999", "sec-fetch-site": "same-site" }],
    ["the scheme changed", { origin: "https://localhost:3999" }],
  ])("refuses %s with 403 and creates nothing", async (_what, headers) => {
    const name = `forged-${Math.random()}`;
    const res = await createProject(name, headers as Record<string, string>);
    expect(res.status).toBe(403);
    expect(JSON.parse(res.body).error.code).toBe("cross_origin");
    expect(await projectCount(name)).toBe(0);
  });

  it("accepts APP_URL and the address the request was sent to (127.0.0.1 or a host name alike)", async () => {
    expect((await createProject("via-app-url", { origin: t.deps.baseURL, "sec-fetch-site": "same-origin" })).status).toBe(201);
    expect((await createProject("via-own-address", { origin: t.url })).status).toBe(201);
    const host = `localhost:${new URL(t.url).port}`;
    expect((await createProject("via-host-name", { origin: `http://${host}`, host })).status).toBe(201);
  });

  it("signs in from the address the app was opened at, and never from a foreign one", async () => {
    const body = JSON.stringify({ email: "engineer@example.com", password: "orthostack-demo" });
    const own = await rawRequest(t.url, "POST", "/api/auth/sign-in/email", {
      headers: { "content-type": "application/json", origin: t.url },
      body,
    });
    expect(own.status).toBe(200);
    const foreign = await rawRequest(t.url, "POST", "/api/auth/sign-in/email", {
      headers: { "content-type": "application/json", origin: "http://127.0.0.1:1" },
      body,
    });
    expect(foreign.status).toBe(403);
    expect(foreign.headers["set-cookie"]).toBeUndefined();
  });

  it("refuses a forged approve, delete and sign-out: nothing changes", async () => {
    const [project] = await t.handle.db.select().from(projects).limit(1);
    const [rev] = await t.handle.db
      .insert(stackRevisions)
      .values({
        workspaceId: project.workspaceId,
        projectId: project.id,
        number: 99,
        status: "in_review",
        stack: JSON.parse(JSON.stringify((await t.handle.db.select().from(stackRevisions).limit(1))[0].stack)),
      })
      .returning();
    const forged = { origin: "http://127.0.0.1:1", "sec-fetch-site": "same-site" };
    const approve = await rawRequest(t.url, "POST", `/api/revisions/${rev.id}/approve`, {
      headers: { cookie: reviewer, "content-type": "application/x-www-form-urlencoded", ...forged },
      body: "comment=ok",
    });
    expect(approve.status).toBe(403);
    const del = await rawRequest(t.url, "DELETE", `/api/projects/${project.id}`, { headers: { cookie: engineer, ...forged } });
    expect(del.status).toBe(403);
    const out = await rawRequest(t.url, "POST", "/api/auth/sign-out", { headers: { cookie: reviewer, ...forged } });
    expect(out.status).toBe(403);
    const [after] = await t.handle.db.select().from(stackRevisions).where(eq(stackRevisions.id, rev.id));
    expect(after.status).toBe("in_review");
    expect((await t.handle.db.select().from(projects).where(eq(projects.id, project.id))).length).toBe(1);
    expect((await t.call("GET", "/api/me", { cookie: reviewer })).status).toBe(200);
  });

  it("a configured trusted origin may write, even cross-site", async () => {
    const app = createApp(t.deps, { trustedOrigins: ["https://stack.example.com"] });
    const server: Server = await new Promise((resolve) => {
      const s = app.listen(0, "127.0.0.1", () => resolve(s));
    });
    try {
      const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
      const ok = await rawRequest(url, "POST", "/api/projects", {
        headers: {
          cookie: engineer,
          "content-type": "application/json",
          origin: "https://stack.example.com",
          "sec-fetch-site": "cross-site",
        },
        body: JSON.stringify({ name: "via-trusted" }),
      });
      expect(ok.status).toBe(201);
      const other = await rawRequest(url, "POST", "/api/projects", {
        headers: { cookie: engineer, "content-type": "application/json", origin: "https://other.example.com" },
        body: JSON.stringify({ name: "via-untrusted" }),
      });
      expect(other.status).toBe(403);
      expect(await projectCount("via-untrusted")).toBe(0);
    } finally {
      await new Promise((r) => server.close(r));
    }
  });
});

describe("request bodies only as JSON (multipart on upload routes)", () => {
  const own = () => ({ cookie: engineer, origin: t.deps.baseURL });

  it.each([
    ["text/plain", '{"name":"plain-text-project"}'],
    ["application/x-www-form-urlencoded", "name=form-project"],
    ["multipart/form-data; boundary=x", '--x\r\nContent-Disposition: form-data; name="name"\r\n\r\nmultipart-project\r\n--x--\r\n'],
  ])("a %s body is refused with 415 on a JSON route", async (type, body) => {
    const res = await rawRequest(t.url, "POST", "/api/projects", { headers: { ...own(), "content-type": type }, body });
    expect(res.status).toBe(415);
    expect(JSON.parse(res.body).error.code).toBe("unsupported_media_type");
    expect(await projectCount("plain-text-project")).toBe(0);
    expect(await projectCount("form-project")).toBe(0);
    expect(await projectCount("multipart-project")).toBe(0);
  });

  it("a body without a content type is refused", async () => {
    const res = await rawRequest(t.url, "POST", "/api/projects", { headers: own(), body: '{"name":"untyped"}' });
    expect(res.status).toBe(415);
  });

  it("an upload route takes multipart only", async () => {
    const [project] = await t.handle.db.select().from(projects).limit(1);
    const res = await rawRequest(t.url, "POST", `/api/projects/${project.id}/datasets`, {
      headers: { ...own(), "content-type": "application/json" },
      body: "{}",
    });
    expect(res.status).toBe(415);
  });

  it("a form-encoded sign-in is refused", async () => {
    const res = await rawRequest(t.url, "POST", "/api/auth/sign-in/email", {
      headers: { origin: t.deps.baseURL, "content-type": "application/x-www-form-urlencoded" },
      body: "email=engineer%40example.com&password=orthostack-demo",
    });
    expect(res.status).toBe(415);
  });
});
