/**
 * Deciding with eyes open (issue 11): a draft whose requirements fail is submitted only once the
 * engineer confirms, having been told which fail, by how much, and from which source.
 */
import { readFileSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { stackRevisions, studies, studyResults } from "@backend/db/schema";
import { estimate, LIVE_TRIALS } from "@shared/engine/live-estimate";
import { liveStudy } from "@shared/engine/live-study";
import { metricLabel } from "@shared/metrics";
import { validateStackFile } from "@shared/schemas/stack-file";
import { startTestApp, type TestApp } from "./harness";

const reference = JSON.parse(readFileSync(new URL("../fixtures/stack-reference.json", import.meta.url), "utf8"));
/** Heading within 2° for 99 % of units: the reference stack's estimate falls short (about 97 %). */
const tight = { metric: "heading.maxAbsDeg", max: 2, yield: 0.99 };
/** Heading within 20° for 90 % of units: every unit of the reference stack meets it. */
const loose = { metric: "heading.maxAbsDeg", max: 20, yield: 0.9, name: "Compass, coarse" };

let t: TestApp;
const c: Record<string, string> = {};
let projectId: string;

beforeAll(async () => {
  t = await startTestApp();
  for (const role of ["engineer", "reviewer"]) c[role] = await t.signIn(`${role}@example.com`);
  projectId = (await t.call("POST", "/api/projects", { cookie: c.engineer, body: { name: "Requirement checks" } })).body.id;
});
afterAll(() => t?.close());

const newDraft = async (requirements: unknown[], stack = reference) =>
  (await t.call("POST", `/api/projects/${projectId}/revisions`, { cookie: c.engineer, body: { stack, requirements, note: "first" } })).body;
const current = (id: string) => t.ifMatch(`/api/revisions/${id}`, c.engineer);
const check = async (id: string, cookie = c.engineer) => t.call("GET", `/api/revisions/${id}/requirement-check`, { cookie });

/** A finished study of the revision written as the runner would, with the yield it found for `tight`. */
async function finishedStudy(revisionId: string, number: number, stack: unknown, predictedYield: number, asBuilt = false) {
  const [rev] = await t.handle.db.select().from(stackRevisions).where(eq(stackRevisions.id, revisionId));
  const [s] = await t.handle.db
    .insert(studies)
    .values({
      workspaceId: rev.workspaceId,
      projectId: rev.projectId,
      revisionId,
      number,
      status: "finished",
      study: { format: "orthostack.study/1", trials: 20000, seed: 3, requirements: [tight] } as typeof studies.$inferInsert.study,
      stack: stack as typeof rev.stack,
      asBuilt: (asBuilt ? [{ source: "mag.bondLine" }] : null) as typeof studies.$inferInsert.asBuilt,
    })
    .returning();
  await t.handle.db.insert(studyResults).values({
    studyId: s.id,
    // only what the check reads of a result file
    result: {
      requirements: [{ ...tight, predictedYield, passes: predictedYield >= tight.yield }],
    } as unknown as typeof studyResults.$inferInsert.result,
    passes: predictedYield >= tight.yield,
  });
  return s.id;
}

describe("requirements judged before submitting", () => {
  it("without a study, the live estimate judges each requirement with the editor's figures", async () => {
    const rev = await newDraft([tight, loose]);
    const r = await check(rev.id, c.reviewer);
    expect(r.status).toBe(200);
    // the editor's own estimate of the same stack (same engine, seed and trials)
    const v = validateStackFile(reference);
    if (!v.ok) throw new Error("reference stack does not validate");
    const editor = estimate(v.stack, liveStudy(v.stack, [tight, loose]));
    expect(r.body.requirements).toHaveLength(2);
    expect(r.body.requirements[0]).toEqual({
      index: 0,
      metric: "heading.maxAbsDeg",
      label: metricLabel("heading.maxAbsDeg"),
      unit: "deg",
      max: 2,
      target: 0.99,
      reached: editor.requirements[0].predictedYield,
      passes: false,
      source: { kind: "estimate", trials: LIVE_TRIALS, inclinationDeg: 60 },
    });
    expect(r.body.requirements[0].reached).toBeLessThan(0.99);
    expect(r.body.requirements[1]).toMatchObject({ index: 1, label: "Compass, coarse", passes: true, reached: 1 });
    expect(r.body.failing).toEqual([r.body.requirements[0]]);
  });

  it("refuses to submit a failing draft until the engineer confirms, and records that they did", async () => {
    const rev = await newDraft([tight, loose]);
    const refused = await t.call("POST", `/api/revisions/${rev.id}/submit`, {
      cookie: c.engineer,
      body: {},
      headers: await current(rev.id),
    });
    expect(refused.status).toBe(409);
    expect(refused.body.error.code).toBe("requirements_not_met");
    expect(refused.body.error.message).toMatch(
      /^1 requirement is not met: Heading error, max over the sweep ≤ 2°: 9\d\.\d+ % of units, 99\.0+ % asked \(live estimate\)/,
    );
    expect((await t.call("GET", `/api/revisions/${rev.id}`, { cookie: c.engineer })).body.status).toBe("draft");

    const malformed = await t.call("POST", `/api/revisions/${rev.id}/submit`, {
      cookie: c.engineer,
      body: { confirmFailing: "yes" },
      headers: await current(rev.id),
    });
    expect(malformed.status).toBe(400);
    expect(malformed.body.error.fields[0].path).toBe("confirmFailing");

    const confirmed = await t.call("POST", `/api/revisions/${rev.id}/submit`, {
      cookie: c.engineer,
      body: { confirmFailing: true },
      headers: await current(rev.id),
    });
    expect(confirmed.status).toBe(200);
    expect(confirmed.body.status).toBe("in_review");
    const act = await t.call("GET", `/api/projects/${projectId}/activity`, { cookie: c.reviewer });
    expect(act.body.activity[0].action).toBe("revision.submitted");
    expect(act.body.activity[0].summary).toMatch(/knowing that 1 requirement is not met: Heading error/);
  });

  it("a draft that meets its requirements, or has none, is submitted without a confirmation", async () => {
    for (const requirements of [[loose], []]) {
      const rev = await newDraft(requirements);
      expect((await check(rev.id)).body.failing).toEqual([]);
      const r = await t.call("POST", `/api/revisions/${rev.id}/submit`, { cookie: c.engineer, body: {}, headers: await current(rev.id) });
      expect(r.status).toBe(200);
      expect(r.body.status).toBe("in_review");
    }
  });

  it("the newest finished design study of the stack as it is now judges before the estimate", async () => {
    const rev = await newDraft([tight]);
    const first = await finishedStudy(rev.id, 901, reference, 0.995);
    let r = await check(rev.id);
    expect(r.body.requirements[0]).toMatchObject({ passes: true, reached: 0.995, source: { kind: "study", studyId: first, number: 901 } });

    // an as-built study judges the line, not the design: left aside
    await finishedStudy(rev.id, 902, reference, 0.5, true);
    // a newer study of the same stack wins
    const third = await finishedStudy(rev.id, 903, reference, 0.97);
    r = await check(rev.id);
    expect(r.body.failing).toEqual([expect.objectContaining({ reached: 0.97, source: { kind: "study", studyId: third, number: 903 } })]);
    const refused = await t.call("POST", `/api/revisions/${rev.id}/submit`, {
      cookie: c.engineer,
      body: {},
      headers: await current(rev.id),
    });
    expect(refused.body.error.message).toMatch(/97\.0+ % of units, 99\.0+ % asked \(study 903\)/);

    // once the draft changes, no study ran on it: back to the estimate
    const changed = structuredClone(reference);
    changed.name = "changed after the studies";
    const patched = await t.call("PATCH", `/api/revisions/${rev.id}`, {
      cookie: c.engineer,
      body: { stack: changed },
      headers: await current(rev.id),
    });
    expect(patched.status).toBe(200);
    r = await check(rev.id);
    expect(r.body.requirements[0].source).toEqual({ kind: "estimate", trials: LIVE_TRIALS, inclinationDeg: 60 });

    // a study that gave no figure at this limit leaves the requirement to the estimate
    const other = await newDraft([{ ...tight, max: 3 }]);
    await finishedStudy(other.id, 904, reference, 0.999);
    expect((await check(other.id)).body.requirements[0].source.kind).toBe("estimate");
  });

  it("an unknown revision is a 404", async () => {
    expect((await check("00000000-0000-4000-8000-000000000000")).status).toBe(404);
  });
});
