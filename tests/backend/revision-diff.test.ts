/**
 * What changed between revisions (issue 11 item 1): the pure diff on a hand-made pair covering
 * every kind of change, and the API on the demo project: its draft (revision 2, based on 1) and a new draft from revision 1 changed through the API in every kind of way.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { readFileSync } from "node:fs";
import { and, eq } from "drizzle-orm";
import { projects, stackRevisions } from "@backend/db/schema";
import { DEMO_PROJECT } from "@backend/seed";
import { diffRevisions } from "@shared/revisions/diff";
import type { StackFile } from "@shared/schemas/stack-file";
import { startTestApp, type TestApp } from "./harness";

const REFERENCE = JSON.parse(readFileSync(new URL("../fixtures/stack-reference.json", import.meta.url), "utf8")) as StackFile;
const REQ = [{ metric: "heading.maxAbsDeg", max: 2, yield: 0.99 }];

describe("diffRevisions on a hand-made pair", () => {
  const before = structuredClone(REFERENCE);
  const after = structuredClone(REFERENCE);
  const el = (s: StackFile, id: string) => s.elements.find((e) => e.id === id)!;
  el(after, "mag").bondLine!.heightTol!.tol = 2; // changed, µm
  el(after, "mag").bondLine!.heightTol!.mean = 0.5; // added field
  delete el(after, "mag").placementTol; // removed tolerance (yaw)
  el(after, "pkg").position = { x: 6.5, y: -3 }; // changed, mm
  after.elements.push({ id: "temp", kind: "spacer", parent: "pkg", position: { x: -1, y: 1 }, size: { x: 1, y: 1, z: 0.2 } });
  const changes = diffRevisions({ stack: before, requirements: REQ }, { stack: after, requirements: [{ ...REQ[0], max: 1.5 }] });
  const by = (path: string) => changes.find((c) => c.path === path);

  it("names a changed tolerance as a person would, with its unit", () => {
    expect(by("elements[mag].bondLine.heightTol.tol")).toEqual({
      path: "elements[mag].bondLine.heightTol.tol",
      label: "mag: bond-line height tolerance",
      kind: "changed",
      before: 3,
      after: 2,
      unit: "µm",
    });
    expect(by("elements[pkg].position.x")).toMatchObject({
      label: "pkg: position x on its parent",
      kind: "changed",
      before: 6,
      after: 6.5,
      unit: "mm",
    });
  });

  it("reports added and removed fields and elements", () => {
    expect(by("elements[mag].bondLine.heightTol.mean")).toMatchObject({
      label: "mag: bond-line height tolerance mean",
      kind: "added",
      before: null,
      after: 0.5,
      unit: "µm",
    });
    expect(by("elements[mag].placementTol.yawDeg.tol")).toMatchObject({
      label: "mag: placement yaw tolerance",
      kind: "removed",
      before: 0.4,
      after: null,
      unit: "°",
    });
    expect(by("elements[temp]")).toMatchObject({ label: "temp: element", kind: "added", after: "temp (spacer on pkg)" });
    expect(changes.filter((c) => c.path.startsWith("elements[temp]."))).toEqual([]);
  });

  it("reports a requirement's limit in the metric's unit", () => {
    expect(by("requirements[heading.maxAbsDeg].max")).toMatchObject({ kind: "changed", before: 2, after: 1.5, unit: "°" });
    expect(by("requirements[heading.maxAbsDeg].max")!.label).toMatch(/^requirement: Heading error/);
  });

  it("finds nothing between a revision and itself, and a removed element as one change", () => {
    expect(diffRevisions({ stack: before, requirements: REQ }, { stack: structuredClone(before), requirements: REQ })).toEqual([]);
    const fewer = structuredClone(REFERENCE);
    fewer.elements = fewer.elements.filter((e) => e.id !== "mag");
    expect(diffRevisions({ stack: REFERENCE, requirements: [] }, { stack: fewer, requirements: [] })).toEqual([
      { path: "elements[mag]", label: "mag: element", kind: "removed", before: "mag (mag on accel)", after: null, unit: null },
    ]);
  });
});

describe("GET /api/revisions/:id/diff", () => {
  let t: TestApp;
  let cookie: Record<string, string>;
  let rev1: string;
  let rev2: string;
  beforeAll(async () => {
    t = await startTestApp({ runner: () => new Promise(() => {}) });
    cookie = { engineer: await t.signIn("engineer@example.com"), reviewer: await t.signIn("reviewer@example.com") };
    const [p] = await t.handle.db.select().from(projects).where(eq(projects.name, DEMO_PROJECT));
    const revs = await t.handle.db.select().from(stackRevisions).where(eq(stackRevisions.projectId, p.id));
    rev1 = revs.find((r) => r.number === 1)!.id;
    rev2 = revs.find((r) => r.number === 2)!.id;
  });
  afterAll(() => t?.close());

  it("shows the demo draft's changes against the revision it is based on", async () => {
    const res = await t.call("GET", `/api/revisions/${rev2}/diff`, { cookie: cookie.reviewer });
    expect(res.status).toBe(200);
    expect(res.body.against).toEqual({ id: rev1, number: 1 });
    const labels = Object.fromEntries(res.body.changes.map((c: { label: string }) => [c.label, c]));
    expect(labels["mag: bond-line thickness"]).toMatchObject({ kind: "changed", before: 10, after: 15, unit: "µm" });
    expect(labels["mag: bond-line height tolerance"]).toMatchObject({ kind: "changed", before: 3, after: 2, unit: "µm" });
    expect(labels["mag: bond-line height tolerance distribution"]).toMatchObject({
      kind: "changed",
      before: "uniform",
      after: "normal",
      unit: null,
    });
    expect(labels["stack name"]).toMatchObject({ kind: "changed" });
    expect(res.body.changes).toHaveLength(4);
  });

  it("compares with another revision when asked, and refuses one from another project", async () => {
    const back = await t.call("GET", `/api/revisions/${rev1}/diff?against=${rev2}`, { cookie: cookie.engineer });
    expect(back.body.against.number).toBe(2);
    expect(back.body.changes.find((c: { label: string }) => c.label === "mag: bond-line thickness")).toMatchObject({
      before: 15,
      after: 10,
    });
    const first = await t.call("GET", `/api/revisions/${rev1}/diff`, { cookie: cookie.engineer });
    expect(first.body).toEqual({ against: null, changes: [] });
    const [other] = await t.handle.db
      .insert(projects)
      .values({
        workspaceId: (await t.handle.db.select().from(stackRevisions).where(eq(stackRevisions.id, rev1)))[0].workspaceId,
        name: "Other",
      })
      .returning();
    const [foreign] = await t.handle.db
      .insert(stackRevisions)
      .values({ workspaceId: other.workspaceId, projectId: other.id, number: 1, stack: REFERENCE })
      .returning();
    const refused = await t.call("GET", `/api/revisions/${rev2}/diff?against=${foreign.id}`, { cookie: cookie.engineer });
    expect(refused.status).toBe(400);
    expect(refused.body.error.fields[0].path).toBe("against");
    expect((await t.call("GET", `/api/revisions/${rev2}/diff?against=nope`, { cookie: cookie.engineer })).body.error.fields[0].path).toBe(
      "against",
    );
  });

  it("asks for a note when a later revision is submitted without one", async () => {
    await t.handle.db
      .update(stackRevisions)
      .set({ note: "" })
      .where(and(eq(stackRevisions.id, rev2)));
    const version = await t.ifMatch(`/api/revisions/${rev2}`, cookie.engineer);
    const none = await t.call("POST", `/api/revisions/${rev2}/submit`, { cookie: cookie.engineer, body: {}, headers: version });
    expect(none.status).toBe(400);
    expect(none.body.error.fields[0].path).toBe("note");
    const ok = await t.call("POST", `/api/revisions/${rev2}/submit`, {
      cookie: cookie.engineer,
      // the demo draft misses a requirement (tests/backend/requirement-check.test.ts): confirmed here
      body: { note: "Film attach under the mag: thinner spread.", confirmFailing: true },
      headers: version,
    });
    expect(ok.status).toBe(200);
    expect(ok.body).toMatchObject({ status: "in_review", note: "Film attach under the mag: thinner spread." });
  });

  it("names every kind of change made through the API on the demo stack, each with its unit", async () => {
    const draft = (await t.call("POST", `/api/revisions/${rev1}/drafts`, { cookie: cookie.engineer, body: {} })).body;
    const stack = structuredClone(draft.stack) as StackFile;
    const el = (id: string) => stack.elements.find((e) => e.id === id)!;
    el("mag").yawDeg = 89.5; // changed
    delete el("mag").placementTol; // removed: its yaw tolerance (half-width, distribution, owner)
    el("asic").bondLine!.heightTol!.mean = 1; // added field
    stack.elements.push({ id: "shim", kind: "spacer", parent: "pkg", position: { x: -1, y: 1 }, size: { x: 0.4, y: 0.4, z: 0.1 } });
    const requirements = draft.requirements.filter((r: { metric: string }) => r.metric !== "gyro.crossAxisTotalPct.x");
    const patched = await t.call("PATCH", `/api/revisions/${draft.id}`, {
      cookie: cookie.engineer,
      body: { stack, requirements },
      headers: await t.ifMatch(`/api/revisions/${draft.id}`, cookie.engineer),
    });
    expect(patched.status, JSON.stringify(patched.body)).toBe(200);

    const res = await t.call("GET", `/api/revisions/${draft.id}/diff`, { cookie: cookie.reviewer });
    expect(res.status).toBe(200);
    expect(res.body.against).toEqual({ id: rev1, number: 1 });
    const seen = (res.body.changes as Array<{ label: string; kind: string; before: unknown; after: unknown; unit: string | null }>)
      .map((c) => [c.kind, c.label, c.before, c.after, c.unit])
      .sort((a, b) => String(a[1]).localeCompare(String(b[1])));
    expect(seen).toEqual([
      ["added", "asic: bond-line height tolerance mean", null, 1, "µm"],
      ["removed", "mag: placement yaw tolerance", 0.4, null, "°"],
      ["removed", "mag: placement yaw tolerance distribution", "normal", null, null],
      ["removed", "mag: placement yaw tolerance owner", "Larkfield Assembly", null, null],
      ["changed", "mag: yaw on its parent", 90, 89.5, "°"],
      ["removed", "requirement: gyro cross-axis total, x, limit", 2, null, "%"],
      ["removed", "requirement: gyro cross-axis total, x, yield target", 99.73, null, "%"],
      ["added", "shim: element", null, "shim (spacer on pkg)", null],
    ]);
  });

  it("starts a draft from an approved revision with no note, so its submit asks for one; the note is edited on the draft", async () => {
    const draft = await t.call("POST", `/api/revisions/${rev1}/drafts`, { cookie: cookie.engineer, body: {} });
    expect(draft.status).toBe(201);
    expect(draft.body).toMatchObject({ status: "draft", basedOnId: rev1, note: "" });
    const id = draft.body.id as string;
    const none = await t.call("POST", `/api/revisions/${id}/submit`, {
      cookie: cookie.engineer,
      body: { note: "   " },
      headers: await t.ifMatch(`/api/revisions/${id}`, cookie.engineer),
    });
    expect(none.status).toBe(400);
    expect(none.body.error.fields[0].path).toBe("note");
    expect((await t.call("GET", `/api/revisions/${id}`, { cookie: cookie.engineer })).body.status).toBe("draft");
    // the note written on the draft beforehand is the one the submit reads
    const noted = await t.call("PATCH", `/api/revisions/${id}`, {
      cookie: cookie.engineer,
      body: { note: "Same stack, tighter mag yaw asked." },
      headers: await t.ifMatch(`/api/revisions/${id}`, cookie.engineer),
    });
    expect(noted.status).toBe(200);
    const ok = await t.call("POST", `/api/revisions/${id}/submit`, {
      cookie: cookie.engineer,
      body: { confirmFailing: true },
      headers: await t.ifMatch(`/api/revisions/${id}`, cookie.engineer),
    });
    expect(ok.status, JSON.stringify(ok.body)).toBe(200);
    expect(ok.body).toMatchObject({ status: "in_review", note: "Same stack, tighter mag yaw asked." });
  });
});
