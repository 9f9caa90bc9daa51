/**
 * Issue 10, item 3: validation cost bounded. A 69 KiB PATCH with 2,400 support points kept the
 * server busy for 21 s, 2,500 nested parents for 10 s. The schema's size limits now refuse such
 * bodies before any check across elements runs, and those checks are linear in what the limits
 * admit. The largest admitted bodies are fed here (the time they take is measured by
 * `npm run bench:bodies`, never asserted); one beyond each limit is a 400 naming the field.
 */
import { readFileSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startTestApp, type TestApp } from "../harness";
import { revisionBodies } from "./large-bodies";

const reference = JSON.parse(readFileSync(new URL("../../fixtures/stack-reference.json", import.meta.url), "utf8"));

let t: TestApp;
let engineer: string;
let projectId: string;

beforeAll(async () => {
  t = await startTestApp({ seed: true });
  engineer = await t.signIn("engineer@example.com");
  const p = await t.call("POST", "/api/projects", { cookie: engineer, body: { name: "Body limits" } });
  expect(p.status).toBe(201);
  projectId = p.body.id;
});
afterAll(async () => t?.close());

/** A fresh draft, then the PATCH (with the draft's ETag when the API hands one out). */
async function patchDraft(body: unknown) {
  const rev = await t.call("POST", `/api/projects/${projectId}/revisions`, { cookie: engineer, body: { stack: reference } });
  expect(rev.status, JSON.stringify(rev.body)).toBe(201);
  const etag = rev.headers.get("etag");
  const versioned =
    typeof rev.body.version === "number" && body && typeof body === "object" ? { ...body, version: rev.body.version } : body;
  return t.call("PATCH", `/api/revisions/${rev.body.id}`, {
    cookie: engineer,
    body: versioned,
    headers: etag ? { "if-match": etag } : {},
  });
}

describe("request bodies at and beyond the size limits", () => {
  for (const c of revisionBodies(reference)) {
    it(`${c.label}: ${c.status}${c.field ? ` naming ${c.field}` : ""}`, async () => {
      const r = await patchDraft(c.body);
      expect(r.status, JSON.stringify(r.body).slice(0, 500)).toBe(c.status);
      if (c.field) expect(r.body.error.fields.map((f: { path: string }) => f.path)).toContain(c.field);
    });
  }

  it("a size limit passed is reported on its own, without the checks across elements", async () => {
    const c = revisionBodies(reference).find((x) => x.label === "2,500 nested parents")!;
    const r = await patchDraft(c.body);
    expect(r.body.error.fields).toEqual([{ path: "stack.elements", message: "a stack may hold at most 200 elements" }]);
  });

  it("the server answers others between the largest bodies", async () => {
    const bodies = revisionBodies(reference).filter((c) => c.status === 200);
    const [patched, health] = await Promise.all([patchDraft(bodies[0].body), t.call("GET", "/api/health")]);
    expect(patched.status).toBe(200);
    expect(health.status).toBe(200);
  });
});
