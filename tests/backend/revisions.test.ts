import { readFileSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { sql } from "drizzle-orm";
import { stackRevisions } from "@backend/db/schema";
import { startTestApp, type TestApp } from "./harness";

const reference = JSON.parse(readFileSync(new URL("../fixtures/stack-reference.json", import.meta.url), "utf8"));

let t: TestApp;
const c: Record<string, string> = {};
let projectId: string;

beforeAll(async () => {
  t = await startTestApp();
  for (const role of ["admin", "engineer", "reviewer", "supplier"]) c[role] = await t.signIn(`${role}@example.com`);
  const p = await t.call("POST", "/api/projects", { cookie: c.engineer, body: { name: "Revision tests" } });
  projectId = p.body.id;
});
afterAll(() => t?.close());

/** The revision's current version as If-Match, read the way a client reads it before a change. */
const current = (id: string) => t.ifMatch(`/api/revisions/${id}`, c.engineer);

const revisionCount = async () =>
  (
    await t.handle.db
      .select({ n: sql<number>`count(*)::int` })
      .from(stackRevisions)
      .where(sql`${stackRevisions.projectId} = ${projectId}`)
  )[0].n;

describe("stack revisions", () => {
  it("stores the reference stack and gives it back unchanged in meaning", async () => {
    const r = await t.call("POST", `/api/projects/${projectId}/revisions`, {
      cookie: c.engineer,
      body: { stack: reference, requirements: [{ metric: "heading.maxAbsDeg", max: 2, yield: 0.99 }] },
    });
    expect(r.status).toBe(201);
    expect(r.body).toMatchObject({ number: 1, status: "draft", name: "reference 9-axis stack" });
    const file = await t.call("GET", `/api/revisions/${r.body.id}/stack-file`, { cookie: c.reviewer });
    expect(file.status).toBe(200);
    expect(file.headers.get("content-disposition")).toMatch(/attachment; filename="reference-9-axis-stack-rev1\.stack\.json"/);
    expect(file.body).toEqual(reference);
    // and the exported file is accepted again as a new revision
    const again = await t.call("POST", `/api/projects/${projectId}/revisions`, { cookie: c.engineer, body: { stack: file.body } });
    expect(again.status).toBe(201);
    expect(again.body.number).toBe(2);
  });

  it("refuses a broken stack with a path for each problem and stores nothing", async () => {
    const before = await revisionCount();
    const broken = structuredClone(reference);
    broken.elements[2].parent = "nowhere";
    broken.elements[3].size.x = 0;
    broken.elements.push({ ...broken.elements[4] });
    const r = await t.call("POST", `/api/projects/${projectId}/revisions`, { cookie: c.engineer, body: { stack: broken } });
    expect(r.status).toBe(400);
    expect(r.body.error.code).toBe("invalid_stack");
    const paths = r.body.error.fields.map((f: { path: string }) => f.path);
    expect(paths).toContain("stack.elements[2].parent");
    expect(paths).toContain("stack.elements[3].size.x");
    expect(paths.some((p: string) => p.startsWith("stack.elements[6]"))).toBe(true);
    expect(await revisionCount()).toBe(before);
  });

  it("refuses a requirement on a metric the stack does not have", async () => {
    const r = await t.call("POST", `/api/projects/${projectId}/revisions`, {
      cookie: c.engineer,
      body: { stack: reference, requirements: [{ metric: "compass.maxAbsDeg", max: 2, yield: 0.99 }] },
    });
    expect(r.status).toBe(400);
    expect(r.body.error.fields[0].path).toBe("requirements[0].metric");
  });

  it("moves draft → in review → approved, freezes it, and starts a new draft from it", async () => {
    const rev = (await t.call("POST", `/api/projects/${projectId}/revisions`, { cookie: c.engineer, body: { stack: reference } })).body;
    const edited = structuredClone(reference);
    edited.name = "edited stack";
    const patch = await t.call("PATCH", `/api/revisions/${rev.id}`, {
      cookie: c.engineer,
      body: { stack: edited },
      headers: await current(rev.id),
    });
    expect(patch.status).toBe(200);
    expect(patch.body.name).toBe("edited stack");

    const draftApproval = await t.call("POST", `/api/revisions/${rev.id}/approve`, {
      cookie: c.reviewer,
      body: {},
      headers: await current(rev.id),
    });
    expect(draftApproval.status).toBe(409);
    expect(draftApproval.body.error.code).toBe("invalid_state");
    expect(
      (
        await t.call("POST", `/api/revisions/${rev.id}/submit`, {
          cookie: c.engineer,
          body: { note: "tolerances for the first build" },
          headers: await current(rev.id),
        })
      ).body.status,
    ).toBe("in_review");
    const inReviewPatch = await t.call("PATCH", `/api/revisions/${rev.id}`, {
      cookie: c.engineer,
      body: { note: "x" },
      headers: await current(rev.id),
    });
    expect(inReviewPatch.status).toBe(409);
    expect(inReviewPatch.body.error.code).toBe("revision_frozen");

    const approved = await t.call("POST", `/api/revisions/${rev.id}/approve`, {
      cookie: c.reviewer,
      body: {},
      headers: await current(rev.id),
    });
    expect(approved.body.status).toBe("approved");
    expect(approved.body.approvedByName).toBe("Rana Haddad");
    const frozen = await t.call("PATCH", `/api/revisions/${rev.id}`, {
      cookie: c.engineer,
      body: { stack: reference },
      headers: await current(rev.id),
    });
    expect(frozen.status).toBe(409);
    expect(frozen.body.error.message).toMatch(/approved and frozen/);

    const draft = await t.call("POST", `/api/revisions/${rev.id}/drafts`, { cookie: c.engineer, body: {} });
    expect(draft.status).toBe(201);
    expect(draft.body).toMatchObject({ status: "draft", basedOnId: rev.id, name: "edited stack" });
  });

  it("a change is answered with the revision as stored, whichever part of it changes", async () => {
    const rev = (await t.call("POST", `/api/projects/${projectId}/revisions`, { cookie: c.engineer, body: { stack: reference } })).body;
    await t.call("POST", `/api/revisions/${rev.id}/comments`, { cookie: c.reviewer, body: { body: "Check the mag bond line." } });
    const edited = structuredClone(reference);
    edited.name = "answered as stored";
    edited.elements[1].size.x += 0.5;
    const changes = [
      { stack: edited },
      { requirements: [{ metric: "heading.maxAbsDeg", max: 1.5, yield: 0.99 }] },
      { note: "only the note" },
      { stack: reference, note: "stack and note" },
    ];
    for (const [i, body] of changes.entries()) {
      const patched = await t.call("PATCH", `/api/revisions/${rev.id}`, { cookie: c.engineer, body, headers: await current(rev.id) });
      expect(patched.status).toBe(200);
      expect(patched.body.version).toBe(rev.version + i + 1);
      const stored = await t.call("GET", `/api/revisions/${rev.id}`, { cookie: c.engineer });
      expect(patched.body).toEqual(stored.body);
      expect(patched.headers.get("etag")).toBe(stored.headers.get("etag"));
    }
    const last = (await t.call("GET", `/api/revisions/${rev.id}`, { cookie: c.engineer })).body;
    expect(last).toMatchObject({
      name: reference.name,
      note: "stack and note",
      requirements: [{ metric: "heading.maxAbsDeg", max: 1.5, yield: 0.99 }],
      comments: [expect.objectContaining({ body: "Check the mag bond line." })],
    });
    expect(last.stack).toEqual(reference);
  });

  it("the revisions list names each revision by its stack as it is now, from the stored name column", async () => {
    const rev = (await t.call("POST", `/api/projects/${projectId}/revisions`, { cookie: c.engineer, body: { stack: reference } })).body;
    const listed = async () =>
      (await t.call("GET", `/api/projects/${projectId}/revisions`, { cookie: c.reviewer })).body.revisions.find(
        (r: { id: string }) => r.id === rev.id,
      );
    expect((await listed()).name).toBe(reference.name);
    const renamed = { ...structuredClone(reference), name: "renamed in the editor" };
    const patched = await t.call("PATCH", `/api/revisions/${rev.id}`, {
      cookie: c.engineer,
      body: { stack: renamed },
      headers: await current(rev.id),
    });
    expect(patched.status).toBe(200);
    expect((await listed()).name).toBe("renamed in the editor");
    // a note alone leaves the name as it is
    await t.call("PATCH", `/api/revisions/${rev.id}`, { cookie: c.engineer, body: { note: "n" }, headers: await current(rev.id) });
    expect((await listed()).name).toBe("renamed in the editor");
    // the column follows the stack whoever writes it (the database's trigger, not the app)
    await t.handle.db.execute(
      sql`update stack_revisions set stack = ${JSON.stringify({ ...renamed, name: "written directly" })}::json where id = ${rev.id}`,
    );
    const [row] = await t.handle.db
      .select({ n: stackRevisions.stackName })
      .from(stackRevisions)
      .where(sql`${stackRevisions.id} = ${rev.id}`);
    expect(row.n).toBe("written directly");
    expect((await listed()).name).toBe("written directly");
  });

  it("a reviewer sends back with a comment, which is kept", async () => {
    const rev = (await t.call("POST", `/api/projects/${projectId}/revisions`, { cookie: c.engineer, body: { stack: reference } })).body;
    await t.call("POST", `/api/revisions/${rev.id}/submit`, {
      cookie: c.engineer,
      body: { note: "tolerances for the first build", version: 1 },
    });
    const noComment = await t.call("POST", `/api/revisions/${rev.id}/return`, {
      cookie: c.reviewer,
      body: {},
      headers: await current(rev.id),
    });
    expect(noComment.status).toBe(400);
    expect(noComment.body.error.fields[0].path).toBe("comment");
    const back = await t.call("POST", `/api/revisions/${rev.id}/return`, {
      cookie: c.reviewer,
      body: { comment: "Mag bond line: use the film's tolerance." },
      headers: await current(rev.id),
    });
    expect(back.body.status).toBe("draft");
    expect(back.body.comments).toEqual([
      expect.objectContaining({ kind: "returned", body: "Mag bond line: use the film's tolerance.", authorName: "Rana Haddad" }),
    ]);
    const act = await t.call("GET", `/api/projects/${projectId}/activity`, { cookie: c.reviewer });
    expect(act.body.activity[0].action).toBe("revision.returned");
  });

  it("engineers write, reviewers review, suppliers get nothing", async () => {
    const rev = (await t.call("POST", `/api/projects/${projectId}/revisions`, { cookie: c.engineer, body: { stack: reference } })).body;
    expect((await t.call("POST", `/api/projects/${projectId}/revisions`, { cookie: c.reviewer, body: { stack: reference } })).status).toBe(
      403,
    );
    expect(
      (await t.call("PATCH", `/api/revisions/${rev.id}`, { cookie: c.reviewer, body: { note: "x" }, headers: await current(rev.id) }))
        .status,
    ).toBe(403);
    await t.call("POST", `/api/revisions/${rev.id}/submit`, {
      cookie: c.engineer,
      body: { note: "tolerances for the first build", version: 1 },
    });
    expect(
      (await t.call("POST", `/api/revisions/${rev.id}/approve`, { cookie: c.engineer, body: {}, headers: await current(rev.id) })).status,
    ).toBe(403);
    for (const path of [`/api/revisions/${rev.id}`, `/api/projects/${projectId}/revisions`, `/api/revisions/${rev.id}/stack-file`]) {
      expect((await t.call("GET", path, { cookie: c.supplier })).status).toBe(403);
    }
  });
});
