/**
 * An archived project is read-only (issue 11 item 4): every change to it or to anything under it
 * answers 409 `project_archived` for staff, reading still works, and after a restore the same
 * change goes through.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { readFileSync } from "node:fs";
import { eq } from "drizzle-orm";
import { projects, studies, suppliers, whatIfRuns } from "@backend/db/schema";
import { insertFinishedStudy } from "./report-fixtures";
import { startTestApp, type TestApp } from "./harness";

const REFERENCE = JSON.parse(readFileSync(new URL("../fixtures/stack-reference.json", import.meta.url), "utf8"));
const STUDY = { ...JSON.parse(readFileSync(new URL("../fixtures/study-reference.json", import.meta.url), "utf8")), trials: 1000 };

let t: TestApp;
const c: Record<string, string> = {};
let workspaceId: string;
let supplierId: string;

beforeAll(async () => {
  // studies here never run: they wait until cancelled
  t = await startTestApp({
    runner: (_input, { signal }) =>
      new Promise((_resolve, reject) => signal.addEventListener("abort", () => reject(new Error("cancelled")))),
  });
  for (const role of ["admin", "engineer", "reviewer"]) c[role] = await t.signIn(`${role}@example.com`);
  const [s] = await t.handle.db.select().from(suppliers).where(eq(suppliers.name, "Larkfield Assembly"));
  workspaceId = s.workspaceId;
  supplierId = s.id;
  // the harness migrates and seeds a fresh database: slow on a busy machine
}, 180_000);
afterAll(() => t?.close());

const boundary = "----archived";
const upload = (name: string) => ({
  raw: `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="${name}"\r\nContent-Type: text/csv\r\n\r\nunit,yaw [deg]\nU1,0.01\nU2,-0.02\n\r\n--${boundary}--\r\n`,
  headers: { "content-type": `multipart/form-data; boundary=${boundary}` },
});

describe("an archived project", () => {
  it("refuses every change under it with project_archived, keeps it readable, and takes changes again once restored", async () => {
    const [p] = await t.handle.db.insert(projects).values({ workspaceId, name: "Archived: read-only" }).returning();
    const done = await insertFinishedStudy(t.handle.db, { workspaceId, projectId: p.id });
    const running = await insertFinishedStudy(t.handle.db, { workspaceId, projectId: p.id, studyStatus: "running" });
    await t.handle.db.update(studies).set({ status: "failed" }).where(eq(studies.id, running.studyId));
    const failedStudy = running.studyId;
    const queued = await insertFinishedStudy(t.handle.db, { workspaceId, projectId: p.id, studyStatus: "running" });
    const draft = (await t.call("POST", `/api/projects/${p.id}/revisions`, { cookie: c.engineer, body: { stack: REFERENCE } })).body;
    const report = await t.call("POST", `/api/studies/${done.studyId}/reports`, { cookie: c.engineer, body: { supplierId } });
    expect(report.status).toBe(201);
    const dataset = await t.call("POST", `/api/projects/${p.id}/datasets`, { cookie: c.engineer, ...upload("lot-1.csv") });
    expect(dataset.status).toBe(201);

    // a sweep "running" as another process would have it (this app's queue leaves it alone)
    const [sweep] = await t.handle.db
      .insert(whatIfRuns)
      .values({
        workspaceId,
        projectId: p.id,
        revisionId: draft.id,
        kind: "sweep",
        status: "running",
        input: { study: STUDY, parameter: "mag.axis", values: [0.3, 0.6] },
        stack: REFERENCE,
        result: { points: [], crossings: [] },
      })
      .returning();

    const archived = await t.call("POST", `/api/projects/${p.id}/archive`, {
      cookie: c.engineer,
      headers: await t.ifMatch(`/api/projects/${p.id}`, c.engineer),
    });
    expect(archived.status).toBe(200);

    const v = (path: string) => t.ifMatch(path, c.engineer);
    type Attempt = [who: string, method: string, path: string, o?: { body?: unknown; headers?: Record<string, string>; raw?: string }];
    const attempts: Attempt[] = [
      ["engineer", "PATCH", `/api/projects/${p.id}`, { body: { name: "renamed" }, headers: await v(`/api/projects/${p.id}`) }],
      ["engineer", "POST", `/api/projects/${p.id}/revisions`, { body: { stack: REFERENCE } }],
      ["engineer", "PATCH", `/api/revisions/${draft.id}`, { body: { note: "changed" }, headers: await v(`/api/revisions/${draft.id}`) }],
      ["engineer", "POST", `/api/revisions/${draft.id}/submit`, { body: {}, headers: await v(`/api/revisions/${draft.id}`) }],
      ["reviewer", "POST", `/api/revisions/${draft.id}/comments`, { body: { body: "a late thought" } }],
      ["engineer", "POST", `/api/revisions/${done.revisionId}/drafts`, { body: {} }],
      [
        "engineer",
        "POST",
        `/api/revisions/${done.revisionId}/studies`,
        { body: { study: JSON.parse(readFileSync(new URL("../fixtures/study-reference.json", import.meta.url), "utf8")) } },
      ],
      ["engineer", "POST", `/api/studies/${queued.studyId}/cancel`, { body: {} }],
      ["engineer", "POST", `/api/revisions/${draft.id}/sweeps`, { body: { study: STUDY, parameter: "mag.axis", values: [0.3, 0.6] } }],
      ["engineer", "POST", `/api/revisions/${draft.id}/allocations`, { body: { study: STUDY, free: ["mag.axis"] } }],
      ["engineer", "POST", `/api/sweeps/${sweep.id}/cancel`, { body: {} }],
      ["engineer", "POST", `/api/studies/${failedStudy}/rerun`, { body: {} }],
      ["engineer", "POST", `/api/studies/${done.studyId}/reports`, { body: { supplierId } }],
      [
        "engineer",
        "PATCH",
        `/api/reports/${report.body.id}`,
        { body: { note: "changed" }, headers: await v(`/api/reports/${report.body.id}`) },
      ],
      [
        "reviewer",
        "POST",
        `/api/reports/${report.body.id}/return`,
        { body: { comment: "no" }, headers: await v(`/api/reports/${report.body.id}`) },
      ],
      ["reviewer", "POST", `/api/reports/${report.body.id}/release`, { body: {}, headers: await v(`/api/reports/${report.body.id}`) }],
      ["reviewer", "POST", `/api/reports/${report.body.id}/comments`, { body: { body: "a late thought" } }],
      ["engineer", "DELETE", `/api/reports/${report.body.id}`, { headers: await v(`/api/reports/${report.body.id}`) }],
      ["engineer", "POST", `/api/projects/${p.id}/datasets`, upload("lot-2.csv")],
      [
        "engineer",
        "PATCH",
        `/api/datasets/${dataset.body.id}`,
        { body: { lotColumn: null }, headers: await v(`/api/datasets/${dataset.body.id}`) },
      ],
      [
        "engineer",
        "PATCH",
        `/api/datasets/${dataset.body.id}/mappings`,
        {
          body: { mappings: [{ column: "yaw [deg]", revisionId: draft.id, source: "mag.yaw" }] },
          headers: await v(`/api/datasets/${dataset.body.id}`),
        },
      ],
      ["engineer", "DELETE", `/api/datasets/${dataset.body.id}`, { headers: await v(`/api/datasets/${dataset.body.id}`) }],
    ];
    const answers = [];
    for (const [who, method, path, o] of attempts) {
      const res = await t.call(method, path, { cookie: c[who], ...o });
      answers.push(`${method} ${path.replace(/[0-9a-f-]{36}/g, ":id")} → ${res.status} ${res.body?.error?.code ?? ""}`.trim());
    }
    expect(answers).toEqual(
      attempts.map(([, method, path]) => `${method} ${path.replace(/[0-9a-f-]{36}/g, ":id")} → 409 project_archived`),
    );

    // reading is untouched
    for (const path of [
      `/api/projects/${p.id}`,
      `/api/revisions/${draft.id}`,
      `/api/reports/${report.body.id}`,
      `/api/datasets/${dataset.body.id}`,
    ]) {
      expect((await t.call("GET", path, { cookie: c.reviewer })).status).toBe(200);
    }

    const restored = await t.call("POST", `/api/projects/${p.id}/restore`, {
      cookie: c.engineer,
      headers: await t.ifMatch(`/api/projects/${p.id}`, c.engineer),
    });
    expect(restored.status).toBe(200);
    const note = await t.call("PATCH", `/api/reports/${report.body.id}`, {
      cookie: c.engineer,
      body: { note: "changed after the restore" },
      headers: await v(`/api/reports/${report.body.id}`),
    });
    expect(note.status).toBe(200);
    expect(
      (
        await t.call("DELETE", `/api/datasets/${dataset.body.id}`, {
          cookie: c.engineer,
          headers: await v(`/api/datasets/${dataset.body.id}`),
        })
      ).status,
    ).toBe(204);
  });
});
