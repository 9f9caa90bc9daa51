/**
 * Records kept (issue 11 item 4): a project holding an approved revision, a released report or
 * an acknowledgement is never deleted by an engineer; it can be archived (read-only, hidden from
 * the default list); an admin deletes it only by confirming with its name, and the workspace's
 * activity keeps a line saying what went.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { readFileSync } from "node:fs";
import { and, eq, isNull } from "drizzle-orm";
import { activities, projects, reports, stackRevisions, suppliers } from "@backend/db/schema";
import { DEMO_PROJECT } from "@backend/seed";
import { startTestApp, type TestApp } from "./harness";
import { emptyReportContent } from "./report-fixtures";

const REFERENCE = JSON.parse(readFileSync(new URL("../fixtures/stack-reference.json", import.meta.url), "utf8"));

let t: TestApp;
let workspaceId: string;
let supplierId: string;
const cookie: Record<string, string> = {};
let n = 0;

beforeAll(async () => {
  t = await startTestApp({ runner: () => new Promise(() => {}) });
  for (const role of ["admin", "engineer", "reviewer"]) cookie[role] = await t.signIn(`${role}@example.com`);
  const [s] = await t.handle.db.select().from(suppliers).where(eq(suppliers.name, "Larkfield Assembly"));
  workspaceId = s.workspaceId;
  supplierId = s.id;
  // the harness migrates and seeds a fresh database: slow on a busy machine
}, 180_000);
afterAll(() => t?.close());

async function project(kept: "none" | "approved" | "released" | "acknowledged") {
  const name = `Records ${kept} ${++n}`;
  const [p] = await t.handle.db.insert(projects).values({ workspaceId, name }).returning();
  const [rev] = await t.handle.db
    .insert(stackRevisions)
    .values({ workspaceId, projectId: p.id, number: 1, status: kept === "none" ? "draft" : "approved", stack: REFERENCE })
    .returning();
  if (kept === "released" || kept === "acknowledged") {
    await t.handle.db.insert(reports).values({
      workspaceId,
      projectId: p.id,
      supplierId,
      revisionId: rev.id,
      number: 800 + n,
      revision: 1,
      status: "released",
      capability: { cpk: 1.33, overrides: {} },
      content: emptyReportContent({ projectId: p.id, revisionId: rev.id, supplier: { id: supplierId, name: "Larkfield Assembly" } }),
      releasedAt: new Date(),
      acknowledgedAt: kept === "acknowledged" ? new Date() : null,
    });
    // only the report is kept here: the revision it came from goes back to a draft
    await t.handle.db.update(stackRevisions).set({ status: "draft" }).where(eq(stackRevisions.id, rev.id));
  }
  return { id: p.id, name };
}

/** The project's current version as If-Match (a deletion, archive or restore names it). */
const current = (id: string) => t.ifMatch(`/api/projects/${id}`, cookie.engineer);
const exists = async (id: string) => (await t.handle.db.select().from(projects).where(eq(projects.id, id))).length === 1;

describe("deleting a project", () => {
  it("an engineer deletes a project that holds nothing kept", async () => {
    const p = await project("none");
    const res = await t.call("DELETE", `/api/projects/${p.id}`, { cookie: cookie.engineer, headers: await current(p.id) });
    expect(res.status).toBe(204);
    expect(await exists(p.id)).toBe(false);
  });

  for (const kept of ["approved", "released", "acknowledged"] as const) {
    it(`an engineer gets 409 for a project with a ${kept} record, and it stays`, async () => {
      const p = await project(kept);
      const res = await t.call("DELETE", `/api/projects/${p.id}`, { cookie: cookie.engineer, headers: await current(p.id) });
      expect(res.status).toBe(409);
      expect(res.body.error.code).toBe("records_kept");
      expect(res.body.error.message).toContain(
        kept === "approved" ? "1 approved revision" : kept === "released" ? "1 released report" : "1 acknowledgement",
      );
      expect(res.body.error.message).toMatch(/Archive/);
      expect(await exists(p.id)).toBe(true);
    });
  }

  it("a reviewer may not delete at all (403), kept records or not", async () => {
    const p = await project("approved");
    const res = await t.call("DELETE", `/api/projects/${p.id}`, { cookie: cookie.reviewer, headers: await current(p.id) });
    expect(res.status).toBe(403);
    expect(await exists(p.id)).toBe(true);
  });

  it("an admin must confirm with the project's exact name; the workspace activity records the deletion", async () => {
    const p = await project("acknowledged");
    const none = await t.call("DELETE", `/api/projects/${p.id}`, { cookie: cookie.admin, headers: await current(p.id) });
    expect(none.status).toBe(409);
    expect(none.body.error.code).toBe("confirmation_required");
    const wrong = await t.call("DELETE", `/api/projects/${p.id}?confirm=${encodeURIComponent(p.name.toUpperCase())}`, {
      cookie: cookie.admin,
      headers: await current(p.id),
    });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.fields[0].path).toBe("confirm");
    expect(await exists(p.id)).toBe(true);
    const ok = await t.call("DELETE", `/api/projects/${p.id}?confirm=${encodeURIComponent(p.name)}`, {
      cookie: cookie.admin,
      headers: await current(p.id),
    });
    expect(ok.status).toBe(204);
    expect(await exists(p.id)).toBe(false);
    const [line] = await t.handle.db
      .select()
      .from(activities)
      .where(and(eq(activities.workspaceId, workspaceId), eq(activities.action, "project.deleted"), isNull(activities.projectId)))
      .then((rows) => rows.filter((r) => (r.data as { projectId?: string }).projectId === p.id));
    expect(line.summary).toBe(`deleted the project “${p.name}” with 1 released report and 1 acknowledgement, confirmed by its name`);
  });
});

describe("archiving a project", () => {
  it("hides it from the default list, shows it with the filter, makes it read-only, and restores", async () => {
    const p = await project("approved");
    const archived = await t.call("POST", `/api/projects/${p.id}/archive`, { cookie: cookie.engineer, headers: await current(p.id) });
    expect(archived.status).toBe(200);
    expect(archived.body.archivedAt).toEqual(expect.any(String));

    const names = async (q: string) =>
      ((await t.call("GET", `/api/projects${q}`, { cookie: cookie.reviewer })).body.projects as Array<{ name: string }>).map((x) => x.name);
    expect(await names("")).not.toContain(p.name);
    expect(await names("?archived=only")).toContain(p.name);
    expect(await names("?archived=all")).toContain(p.name);
    expect(await names("?archived=only")).not.toContain(DEMO_PROJECT);
    expect(await names("")).toContain(DEMO_PROJECT);
    expect((await t.call("GET", "/api/projects?archived=some", { cookie: cookie.reviewer })).body.error.fields[0].path).toBe("archived");

    const rename = await t.call("PATCH", `/api/projects/${p.id}`, {
      cookie: cookie.engineer,
      body: { name: "changed" },
      headers: { "if-match": archived.headers.get("etag")! },
    });
    expect(rename.status).toBe(409);
    expect(rename.body.error.code).toBe("project_archived");
    const revise = await t.call("POST", `/api/projects/${p.id}/revisions`, { cookie: cookie.engineer, body: { stack: REFERENCE } });
    expect(revise.status).toBe(409);
    expect((await t.call("POST", `/api/projects/${p.id}/archive`, { cookie: cookie.engineer, headers: await current(p.id) })).status).toBe(
      409,
    );

    const restored = await t.call("POST", `/api/projects/${p.id}/restore`, { cookie: cookie.engineer, headers: await current(p.id) });
    expect(restored.status).toBe(200);
    expect(restored.body.archivedAt).toBeNull();
    expect(await names("")).toContain(p.name);
    expect((await t.call("POST", `/api/projects/${p.id}/revisions`, { cookie: cookie.engineer, body: { stack: REFERENCE } })).status).toBe(
      201,
    );
  });
});
