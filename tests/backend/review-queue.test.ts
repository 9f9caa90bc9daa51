/**
 * What waits for whom (GET /api/review-queue, issue 11 "a reviewer's home shows what awaits
 * review; the project list and navigation show counts"): read from the records, so each step of
 * a revision's and a report's life moves the item from one person's list to the other's.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { readFileSync } from "node:fs";
import { eq } from "drizzle-orm";
import { projects, suppliers } from "@backend/db/schema";
import type { ReviewQueue } from "@shared/schemas/review-queue";
import { insertFinishedStudy } from "./report-fixtures";
import { startTestApp, type TestApp } from "./harness";

const REFERENCE = JSON.parse(readFileSync(new URL("../fixtures/stack-reference.json", import.meta.url), "utf8"));

let t: TestApp;
const c: Record<string, string> = {};
const names: Record<string, string> = {};
let workspaceId: string;
let supplierId: string;

beforeAll(async () => {
  t = await startTestApp({ runner: () => new Promise(() => {}) });
  for (const role of ["admin", "engineer", "reviewer", "supplier"]) {
    c[role] = await t.signIn(`${role}@example.com`);
    names[role] = (await t.call("GET", "/api/me", { cookie: c[role] })).body.user.name;
  }
  const [s] = await t.handle.db.select().from(suppliers).where(eq(suppliers.name, "Larkfield Assembly"));
  workspaceId = s.workspaceId;
  supplierId = s.id;
  // the harness migrates and seeds a fresh database: slow on a busy machine
}, 180_000);
afterAll(() => t?.close());

const queue = async (who: string) => {
  const res = await t.call("GET", "/api/review-queue", { cookie: c[who] });
  expect(res.status).toBe(200);
  return res.body as ReviewQueue;
};
/** The items of one project only (the demo seed has its own). */
const itemsIn = async (who: string, projectId: string) => (await queue(who)).items.filter((i) => i.projectId === projectId);
const countsOf = async (who: string, projectId: string) =>
  (await queue(who)).awaitingReview.find((a) => a.projectId === projectId) ?? { projectId, revisions: 0, reports: 0 };

async function newProject(name: string) {
  const [p] = await t.handle.db.insert(projects).values({ workspaceId, name }).returning();
  return p.id;
}

describe("GET /api/review-queue", () => {
  it("moves a revision between the reviewer's list and its author's as it is submitted, sent back and approved", async () => {
    const projectId = await newProject("Queue: revisions");
    const rev = (await t.call("POST", `/api/projects/${projectId}/revisions`, { cookie: c.engineer, body: { stack: REFERENCE } })).body;
    const version = () => t.ifMatch(`/api/revisions/${rev.id}`, c.engineer);
    expect(await itemsIn("reviewer", projectId)).toEqual([]);

    await t.call("POST", `/api/revisions/${rev.id}/submit`, { cookie: c.engineer, body: {}, headers: await version() });
    const [waiting] = await itemsIn("reviewer", projectId);
    expect(waiting).toMatchObject({
      kind: "revision.review",
      title: "Revision 1 of “Queue: revisions”",
      projectName: "Queue: revisions",
      link: `/projects/${projectId}/revisions/${rev.id}`,
      by: names.engineer,
    });
    expect(Date.parse(waiting.since)).not.toBeNaN();
    // an admin reviews too; the engineer cannot
    expect((await itemsIn("admin", projectId)).map((i) => i.kind)).toEqual(["revision.review"]);
    expect(await itemsIn("engineer", projectId)).toEqual([]);
    // the count is the project's, the same for everyone on the staff
    expect(await countsOf("engineer", projectId)).toEqual({ projectId, revisions: 1, reports: 0 });

    await t.call("POST", `/api/revisions/${rev.id}/return`, {
      cookie: c.reviewer,
      body: { comment: "Name the glue." },
      headers: await version(),
    });
    expect(await itemsIn("reviewer", projectId)).toEqual([]);
    expect(await countsOf("reviewer", projectId)).toEqual({ projectId, revisions: 0, reports: 0 });
    expect(await itemsIn("engineer", projectId)).toEqual([
      expect.objectContaining({ kind: "revision.returned", title: "Revision 1 of “Queue: revisions”", by: names.reviewer }),
    ]);
    // sent back to its author only
    expect((await itemsIn("admin", projectId)).map((i) => i.kind)).toEqual([]);

    await t.call("POST", `/api/revisions/${rev.id}/submit`, { cookie: c.engineer, body: {}, headers: await version() });
    expect(await itemsIn("engineer", projectId)).toEqual([]);
    expect((await itemsIn("reviewer", projectId)).map((i) => i.kind)).toEqual(["revision.review"]);
    await t.call("POST", `/api/revisions/${rev.id}/approve`, { cookie: c.reviewer, body: {}, headers: await version() });
    expect(await itemsIn("reviewer", projectId)).toEqual([]);
    expect(await itemsIn("engineer", projectId)).toEqual([]);
  });

  it("a report draft waits for release until sent back, again once changed, and a supplier's question until answered", async () => {
    const projectId = await newProject("Queue: reports");
    const f = await insertFinishedStudy(t.handle.db, { workspaceId, projectId });
    const built = await t.call("POST", `/api/studies/${f.studyId}/reports`, { cookie: c.engineer, body: { supplierId } });
    expect(built.status).toBe(201);
    const id = built.body.id as string;
    const title = `${built.body.code} revision 1 for Larkfield Assembly`;
    const version = () => t.ifMatch(`/api/reports/${id}`, c.engineer);

    expect(await itemsIn("reviewer", projectId)).toEqual([
      expect.objectContaining({ kind: "report.release", title, link: `/reports/${id}`, by: names.engineer }),
    ]);
    expect(await countsOf("reviewer", projectId)).toEqual({ projectId, revisions: 0, reports: 1 });

    await t.call("POST", `/api/reports/${id}/return`, { cookie: c.reviewer, body: { comment: "Ask Cpk 1.67." }, headers: await version() });
    expect(await itemsIn("reviewer", projectId)).toEqual([]);
    expect(await countsOf("reviewer", projectId)).toEqual({ projectId, revisions: 0, reports: 0 });
    expect(await itemsIn("engineer", projectId)).toEqual([expect.objectContaining({ kind: "report.returned", title, by: names.reviewer })]);

    const changed = await t.call("PATCH", `/api/reports/${id}`, { cookie: c.engineer, body: { cpk: 1.67 }, headers: await version() });
    expect(changed.status).toBe(200);
    expect(await itemsIn("engineer", projectId)).toEqual([]);
    expect((await itemsIn("reviewer", projectId)).map((i) => i.kind)).toEqual(["report.release"]);

    await t.call("POST", `/api/reports/${id}/release`, { cookie: c.reviewer, body: {}, headers: await version() });
    expect(await itemsIn("reviewer", projectId)).toEqual([]);
    await t.call("POST", `/api/reports/${id}/send`, { cookie: c.engineer, body: {} });

    await t.call("POST", `/api/reports/${id}/comments`, { cookie: c.supplier, body: { body: "Which face is the datum?" } });
    expect(await itemsIn("engineer", projectId)).toEqual([
      expect.objectContaining({ kind: "report.question", title, link: `/reports/${id}`, by: names.supplier }),
    ]);
    // the question is the report's engineer's to answer
    expect(await itemsIn("reviewer", projectId)).toEqual([]);
    await t.call("POST", `/api/reports/${id}/comments`, { cookie: c.engineer, body: { body: "The lid side." } });
    expect(await itemsIn("engineer", projectId)).toEqual([]);
  });

  it("leaves archived projects out, and is not a supplier's", async () => {
    const projectId = await newProject("Queue: archived");
    const rev = (await t.call("POST", `/api/projects/${projectId}/revisions`, { cookie: c.engineer, body: { stack: REFERENCE } })).body;
    await t.call("POST", `/api/revisions/${rev.id}/submit`, {
      cookie: c.engineer,
      body: {},
      headers: await t.ifMatch(`/api/revisions/${rev.id}`, c.engineer),
    });
    expect(await itemsIn("reviewer", projectId)).toHaveLength(1);
    const archived = await t.call("POST", `/api/projects/${projectId}/archive`, {
      cookie: c.engineer,
      body: {},
      headers: await t.ifMatch(`/api/projects/${projectId}`, c.engineer),
    });
    expect(archived.status).toBe(200);
    expect(await itemsIn("reviewer", projectId)).toEqual([]);
    expect((await queue("reviewer")).awaitingReview.some((a) => a.projectId === projectId)).toBe(false);

    const supplier = await t.call("GET", "/api/review-queue", { cookie: c.supplier });
    expect(supplier.status).toBe(403);
  });
});
