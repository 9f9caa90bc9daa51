/**
 * Who must act (issue 11 item 2): every notification kind reaches the people concerned in the
 * app and as a mail caught by the local catcher; the actor is not told of their own act; a
 * person's opt-out stops the mail of that kind only, and not the notification, until turned on
 * again; a report draft changed after it was sent back tells the reviewers again; reading marks them.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { readFileSync } from "node:fs";
import { and, eq } from "drizzle-orm";
import { members, outboxMessages, projects, suppliers, users } from "@backend/db/schema";
import { insertFinishedStudy } from "./report-fixtures";
import { startTestApp, type TestApp } from "./harness";

const REFERENCE = JSON.parse(readFileSync(new URL("../fixtures/stack-reference.json", import.meta.url), "utf8"));

let t: TestApp;
const c: Record<string, string> = {};
let workspaceId: string;
let supplierId: string;

beforeAll(async () => {
  t = await startTestApp({ runner: () => new Promise(() => {}) });
  for (const role of ["admin", "engineer", "reviewer", "supplier"]) c[role] = await t.signIn(`${role}@example.com`);
  const [s] = await t.handle.db.select().from(suppliers).where(eq(suppliers.name, "Larkfield Assembly"));
  workspaceId = s.workspaceId;
  supplierId = s.id;
  // the harness migrates and seeds a fresh database: slow on a busy machine
}, 180_000);
afterAll(() => t?.close());

type N = { id: string; kind: string; title: string; link: string; readAt: string | null };
const list = async (who: string) =>
  (await t.call("GET", "/api/notifications", { cookie: c[who] })).body as { notifications: N[]; unread: number };
const latest = async (who: string) => (await list(who)).notifications[0];
const mailsTo = async (email: string, subject: string) =>
  (await t.handle.db.select().from(outboxMessages)).filter((m) => m.recipients.includes(email) && m.subject === subject);

describe("revision notifications", () => {
  it("submitted → reviewers; sent back and approved → the author; each with its mail", async () => {
    const [p] = await t.handle.db.insert(projects).values({ workspaceId, name: "Notified project" }).returning();
    const rev = (await t.call("POST", `/api/projects/${p.id}/revisions`, { cookie: c.engineer, body: { stack: REFERENCE } })).body;
    const beforeEngineer = (await list("engineer")).unread;
    const revVersion = () => t.ifMatch(`/api/revisions/${rev.id}`, c.engineer);
    await t.call("POST", `/api/revisions/${rev.id}/submit`, { cookie: c.engineer, body: {}, headers: await revVersion() });

    const waiting = await latest("reviewer");
    expect(waiting).toMatchObject({
      kind: "revision.submitted",
      title: "Revision 1 of “Notified project” waits for your review",
      link: `/projects/${p.id}/revisions/${rev.id}`,
      readAt: null,
    });
    expect(await mailsTo("reviewer@example.com", waiting.title)).toHaveLength(1);
    expect((await list("engineer")).unread).toBe(beforeEngineer); // not told of their own act
    expect((await list("admin")).notifications.some((n) => n.link.includes(rev.id))).toBe(false);

    await t.call("POST", `/api/revisions/${rev.id}/return`, {
      cookie: c.reviewer,
      body: { comment: "Use the film's tolerance." },
      headers: await revVersion(),
    });
    const back = await latest("engineer");
    expect(back).toMatchObject({ kind: "revision.returned", title: "Revision 1 of “Notified project” was sent back" });
    const [mail] = await mailsTo("engineer@example.com", back.title);
    expect(mail.text).toContain("Use the film's tolerance.");
    expect(mail.text).toContain(`/projects/${p.id}/revisions/${rev.id}`);

    // the reviewer turns off the mail of submitted revisions: told in the app, no mail; turned on again, mailed
    const off = await t.call("PUT", "/api/notification-settings", { cookie: c.reviewer, body: { email: { "revision.submitted": false } } });
    expect(off.body.kinds.find((k: { kind: string }) => k.kind === "revision.submitted").email).toBe(false);
    expect(off.body.kinds.find((k: { kind: string }) => k.kind === "report.ready").email).toBe(true);
    await t.call("POST", `/api/revisions/${rev.id}/submit`, { cookie: c.engineer, body: {}, headers: await revVersion() });
    const second = await latest("reviewer");
    expect(second).toMatchObject({ kind: "revision.submitted", readAt: null });
    expect(second.id).not.toBe(waiting.id);
    expect(await mailsTo("reviewer@example.com", waiting.title)).toHaveLength(1); // still only the first
    await t.call("POST", `/api/revisions/${rev.id}/return`, {
      cookie: c.reviewer,
      body: { comment: "Once more." },
      headers: await revVersion(),
    });
    await t.call("PUT", "/api/notification-settings", { cookie: c.reviewer, body: { email: { "revision.submitted": true } } });
    await t.call("POST", `/api/revisions/${rev.id}/submit`, { cookie: c.engineer, body: {}, headers: await revVersion() });
    expect(await mailsTo("reviewer@example.com", waiting.title)).toHaveLength(2);

    await t.call("POST", `/api/revisions/${rev.id}/approve`, { cookie: c.reviewer, body: {}, headers: await revVersion() });
    const ok = await latest("engineer");
    expect(ok).toMatchObject({ kind: "revision.approved", title: "Revision 1 of “Notified project” was approved" });
    expect(await mailsTo("engineer@example.com", ok.title)).toHaveLength(1);
  });
});

describe("report notifications", () => {
  it("ready → reviewers; returned, released, sent, question, acknowledged, measurements → the engineer; opt-out stops only the mail", async () => {
    const settings = await t.call("PUT", "/api/notification-settings", {
      cookie: c.engineer,
      body: { email: { "report.released": false } },
    });
    expect(settings.status).toBe(200);
    expect(settings.body.kinds.find((k: { kind: string }) => k.kind === "report.released")).toMatchObject({
      email: false,
      label: "Your report was released",
    });
    expect(settings.body.kinds.find((k: { kind: string }) => k.kind === "report.sent").email).toBe(true);
    expect(
      (await t.call("PUT", "/api/notification-settings", { cookie: c.engineer, body: { email: { "report.lost": false } } })).status,
    ).toBe(400);

    const f = await insertFinishedStudy(t.handle.db, { workspaceId });
    const built = await t.call("POST", `/api/studies/${f.studyId}/reports`, { cookie: c.engineer, body: { supplierId } });
    expect(built.status).toBe(201);
    const id = built.body.id as string;
    const title = `${built.body.code} revision 1`;

    const ready = await latest("reviewer");
    expect(ready).toMatchObject({
      kind: "report.ready",
      title: `${title} for Larkfield Assembly waits for release`,
      link: `/reports/${id}`,
    });
    expect(await mailsTo("reviewer@example.com", ready.title)).toHaveLength(1);

    const reportVersion = () => t.ifMatch(`/api/reports/${id}`, c.reviewer);
    await t.call("POST", `/api/reports/${id}/return`, {
      cookie: c.reviewer,
      body: { comment: "Ask Cpk 1.67 on the mag yaw." },
      headers: await reportVersion(),
    });
    const back = await latest("engineer");
    expect(back).toMatchObject({ kind: "report.returned", title: `${title} for Larkfield Assembly was sent back` });
    expect((await mailsTo("engineer@example.com", back.title))[0].text).toContain("Ask Cpk 1.67 on the mag yaw.");
    const report = await t.call("GET", `/api/reports/${id}`, { cookie: c.engineer });
    expect(report.body.status).toBe("draft");
    expect(report.body.comments.at(-1)).toMatchObject({ kind: "returned", body: "Ask Cpk 1.67 on the mag yaw." });

    // changed after it was sent back, it waits for release again: the reviewers are told once more
    const readyBefore = (await mailsTo("reviewer@example.com", ready.title)).length;
    const changed = await t.call("PATCH", `/api/reports/${id}`, {
      cookie: c.engineer,
      body: { cpk: 1.67 },
      headers: await reportVersion(),
    });
    expect(changed.status).toBe(200);
    const again = await latest("reviewer");
    expect(again).toMatchObject({ kind: "report.ready", title: ready.title, readAt: null });
    expect(again.id).not.toBe(ready.id);
    const mails = await mailsTo("reviewer@example.com", ready.title);
    expect(mails).toHaveLength(readyBefore + 1);
    expect(mails.at(-1)!.text).toContain("changed it after it was sent back");
    // a further change of a draft nobody sent back tells nobody
    await t.call("PATCH", `/api/reports/${id}`, { cookie: c.engineer, body: { note: "Cpk 1.67 on all." }, headers: await reportVersion() });
    expect(await latest("reviewer")).toEqual(again);

    await t.call("POST", `/api/reports/${id}/release`, { cookie: c.reviewer, body: {}, headers: await reportVersion() });
    const released = await latest("engineer");
    expect(released).toMatchObject({ kind: "report.released" });
    expect(await mailsTo("engineer@example.com", released.title)).toHaveLength(0); // opted out

    expect((await t.call("POST", `/api/reports/${id}/send`, { cookie: c.engineer, body: {} })).status).toBe(200);
    // the engineer sent it: no notification to themself; a reviewer sending tells the engineer
    expect((await latest("engineer")).kind).toBe("report.released");
    await t.call("POST", `/api/reports/${id}/send`, { cookie: c.reviewer, body: {} });
    const sent = await latest("engineer");
    expect(sent).toMatchObject({ kind: "report.sent", title: `${title} was sent to Larkfield Assembly` });
    expect(await mailsTo("engineer@example.com", sent.title)).toHaveLength(1);

    await t.call("POST", `/api/reports/${id}/comments`, { cookie: c.supplier, body: { body: "Which side is the datum?" } });
    const q = await latest("engineer");
    expect(q).toMatchObject({ kind: "report.question", title: `Larkfield Assembly asked a question on ${title}` });
    expect((await mailsTo("engineer@example.com", q.title))[0].text).toContain("Which side is the datum?");

    await t.call("POST", `/api/reports/${id}/acknowledge`, { cookie: c.supplier, body: {}, headers: await reportVersion() });
    const ack = await latest("engineer");
    expect(ack).toMatchObject({ kind: "report.acknowledged", title: `Larkfield Assembly acknowledged ${title}` });
    expect(await mailsTo("engineer@example.com", ack.title)).toHaveLength(1);

    const boundary = "----n11";
    const raw = `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="lot-7.csv"\r\nContent-Type: text/csv\r\n\r\ndie,yaw [deg]\nD1,0.02\nD2,-0.01\n\r\n--${boundary}--\r\n`;
    const up = await t.call("POST", `/api/reports/${id}/datasets`, {
      cookie: c.supplier,
      raw,
      headers: { "content-type": `multipart/form-data; boundary=${boundary}` },
    });
    expect(up.status).toBe(201);
    const m = await latest("engineer");
    expect(m).toMatchObject({ kind: "report.measurements", title: `Larkfield Assembly sent measurements for ${title}` });
    expect(await mailsTo("engineer@example.com", m.title)).toHaveLength(1);
  });

  it("marks given notifications read, then all; nobody reads another's", async () => {
    const before = await list("engineer");
    expect(before.unread).toBeGreaterThan(1);
    const one = before.notifications[0];
    const after = (await t.call("POST", "/api/notifications/read", { cookie: c.engineer, body: { ids: [one.id] } })).body;
    expect(after.unread).toBe(before.unread - 1);
    expect(after.notifications[0].readAt).toEqual(expect.any(String));
    const other = await t.call("POST", "/api/notifications/read", { cookie: c.reviewer, body: {} });
    expect(other.body.unread).toBe(0);
    expect((await list("engineer")).unread).toBe(before.unread - 1);
    expect(
      (await t.call("POST", "/api/notifications/read", { cookie: c.engineer, body: { ids: ["x"] } })).body.error.fields[0].path,
    ).toMatch(/^ids/);
    expect((await t.call("POST", "/api/notifications/read", { cookie: c.engineer, body: {} })).body.unread).toBe(0);
  });
});

describe("a workspace without a reviewer", () => {
  it("tells its admins what waits for review, and no longer once a reviewer is back", async () => {
    const [reviewer] = await t.handle.db.select().from(users).where(eq(users.email, "reviewer@example.com"));
    const asReviewer = and(eq(members.workspaceId, workspaceId), eq(members.userId, reviewer.id));
    await t.handle.db.update(members).set({ role: "engineer" }).where(asReviewer);
    try {
      const [p] = await t.handle.db.insert(projects).values({ workspaceId, name: "Small team" }).returning();
      const rev = (await t.call("POST", `/api/projects/${p.id}/revisions`, { cookie: c.engineer, body: { stack: REFERENCE } })).body;
      const headers = await t.ifMatch(`/api/revisions/${rev.id}`, c.engineer);
      expect((await t.call("POST", `/api/revisions/${rev.id}/submit`, { cookie: c.engineer, body: {}, headers })).status).toBe(200);
      const told = await latest("admin");
      expect(told).toMatchObject({ kind: "revision.submitted", link: `/projects/${p.id}/revisions/${rev.id}` });
      expect(await mailsTo("admin@example.com", told.title)).toHaveLength(1);
    } finally {
      await t.handle.db.update(members).set({ role: "reviewer" }).where(asReviewer);
    }
    // with a reviewer again, the reviewer is told and the admin is not
    const [q] = await t.handle.db.insert(projects).values({ workspaceId, name: "Team again" }).returning();
    const rev2 = (await t.call("POST", `/api/projects/${q.id}/revisions`, { cookie: c.engineer, body: { stack: REFERENCE } })).body;
    const headers2 = await t.ifMatch(`/api/revisions/${rev2.id}`, c.engineer);
    await t.call("POST", `/api/revisions/${rev2.id}/submit`, { cookie: c.engineer, body: {}, headers: headers2 });
    expect((await list("admin")).notifications.some((n) => n.link.includes(rev2.id))).toBe(false);
    expect((await latest("reviewer")).link).toBe(`/projects/${q.id}/revisions/${rev2.id}`);
  });
});
