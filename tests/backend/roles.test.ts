/**
 * The role table: every API route, called as each role and as nobody. A route that is not in
 * the table fails the first test, so a new route cannot ship without its rights written down.
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import { eq } from "drizzle-orm";
import { createApp } from "@backend/app";
import { readFileSync } from "node:fs";
import {
  datasets,
  invitations,
  members,
  outboxMessages,
  projects,
  reports,
  stackRevisions,
  studies,
  supplierContacts,
  suppliers,
  users,
  whatIfRuns,
} from "@backend/db/schema";
import type { Role } from "@shared/schemas/common";
import { startTestApp, type TestApp } from "./harness";
import { registeredApiRoutes } from "./route-table";
import { insertFinishedStudy, emptyReportContent } from "./report-fixtures";
import type { WhatIfInput, WhatIfResult } from "@shared/schemas/what-if";

const REFERENCE = JSON.parse(readFileSync(new URL("../fixtures/stack-reference.json", import.meta.url), "utf8"));

const STUDY = { ...JSON.parse(readFileSync(new URL("../fixtures/study-reference.json", import.meta.url), "utf8")), trials: 1000 };

type Who = Role | "nobody";
const WHO: Who[] = ["nobody", "admin", "engineer", "reviewer", "supplier"];
const STAFF: Role[] = ["admin", "engineer", "reviewer"];
const WRITERS: Role[] = ["admin", "engineer"];
const ADMIN: Role[] = ["admin"];
const REVIEWERS: Role[] = ["admin", "reviewer"];
const EVERYONE: Role[] = ["admin", "engineer", "reviewer", "supplier"];

type Ctx = { t: TestApp; workspaceId: string; supplierId: string };
type Row = {
  route: string;
  /** "public": no session needed; otherwise the roles that may. */
  allowed: Role[] | "public";
  /** Builds the concrete path (and a fresh resource for destructive calls). */
  path?: (c: Ctx) => Promise<string> | string;
  body?: (c: Ctx) => unknown;
  /** A multipart upload of one file in the field "file", instead of a JSON body. */
  upload?: { name: string; content: string };
  /** The version the change is based on, sent as If-Match (a fresh record is at 1; backend/lib/versions.ts). */
  version?: number;
};

let counter = 0;
const uniq = () => `${Date.now().toString(36)}-${++counter}`;

async function freshProject(c: Ctx, archived = false) {
  const [p] = await c.t.handle.db
    .insert(projects)
    .values({ workspaceId: c.workspaceId, name: `p-${uniq()}`, archivedAt: archived ? new Date() : null })
    .returning();
  return p.id;
}
async function freshSupplier(c: Ctx) {
  const [s] = await c.t.handle.db
    .insert(suppliers)
    .values({ workspaceId: c.workspaceId, name: `s-${uniq()}` })
    .returning();
  return s.id;
}
async function freshContact(c: Ctx, supplierId = c.supplierId) {
  const [x] = await c.t.handle.db
    .insert(supplierContacts)
    .values({ supplierId, name: "c", email: `${uniq()}@x.example` })
    .returning();
  return x.id;
}
async function freshMember(c: Ctx) {
  const id = randomUUID();
  await c.t.handle.db.insert(users).values({ id, name: "m", email: `${uniq()}@m.example` });
  const [m] = await c.t.handle.db.insert(members).values({ workspaceId: c.workspaceId, userId: id, role: "engineer" }).returning();
  return m.id;
}
async function freshRevision(c: Ctx, status: "draft" | "in_review" | "approved" = "draft") {
  const projectId = await freshProject(c);
  const [r] = await c.t.handle.db
    .insert(stackRevisions)
    .values({ workspaceId: c.workspaceId, projectId, number: 1, status, stack: REFERENCE })
    .returning();
  return r.id;
}
async function freshStudy(c: Ctx, status: "queued" | "failed" | "finished" = "queued") {
  const revisionId = await freshRevision(c);
  const [rev] = await c.t.handle.db.select().from(stackRevisions).where(eq(stackRevisions.id, revisionId));
  const [s] = await c.t.handle.db
    .insert(studies)
    .values({
      workspaceId: c.workspaceId,
      projectId: rev.projectId,
      revisionId,
      number: 1,
      status,
      study: { ...STUDY },
      stack: REFERENCE,
      trialsTotal: STUDY.trials,
    })
    .returning();
  return s.id;
}
/** A finished what-if run (a sweep with no points, or a verified allocation that tightens mag.axis). */
async function freshWhatIf(c: Ctx, kind: "sweep" | "allocation", status: "finished" | "running" = "finished") {
  const revisionId = await freshRevision(c);
  const [rev] = await c.t.handle.db.select().from(stackRevisions).where(eq(stackRevisions.id, revisionId));
  const cost = { a: 0.1, b: 0.05, k: 2 };
  const source = { source: "mag.axis", unit: "deg" as const, free: true, current: 0.6, proposed: 0.5, cost, min: 0.06, max: 1.8 };
  const result: WhatIfResult =
    kind === "sweep"
      ? { points: [], crossings: [] }
      : {
          verified: true,
          feasible: true,
          allAtUpperBound: false,
          trials: STUDY.trials,
          seed: STUDY.seed,
          message: "fixture",
          method: "fixture",
          sources: [{ ...source, costCurrent: 0.24, costProposed: 0.3, atBound: null, noInfluence: false }],
          requirements: [],
          rounds: [],
          totalCostCurrent: 0.24,
          totalCostProposed: 0.3,
        };
  const input: WhatIfInput = kind === "sweep" ? { study: STUDY, parameter: "mag.axis", values: [0.3, 0.6] } : { study: STUDY };
  const [w] = await c.t.handle.db
    .insert(whatIfRuns)
    .values({ workspaceId: c.workspaceId, projectId: rev.projectId, revisionId, kind, status, input, stack: REFERENCE, result })
    .returning();
  return w.id;
}
async function freshInvitation(c: Ctx) {
  const [i] = await c.t.handle.db
    .insert(invitations)
    .values({
      workspaceId: c.workspaceId,
      email: `${uniq()}@i.example`,
      role: "engineer",
      token: `tok-${uniq()}-${"x".repeat(24)}`,
      expiresAt: new Date(Date.now() + 86_400_000),
    })
    .returning();
  return i;
}

async function freshDataset(c: Ctx) {
  const revisionId = await freshRevision(c);
  const [rev] = await c.t.handle.db.select().from(stackRevisions).where(eq(stackRevisions.id, revisionId));
  const [d] = await c.t.handle.db
    .insert(datasets)
    .values({
      workspaceId: c.workspaceId,
      projectId: rev.projectId,
      name: "m.csv",
      fileType: "csv",
      sizeBytes: 20,
      sha256: "0".repeat(64),
      rowCount: 3,
      columns: [
        {
          key: "yaw [deg]",
          name: "yaw",
          letter: "A",
          unit: "deg",
          kind: "number",
          summary: { n: 3, mean: 0.2, std: 0.1, min: 0.1, max: 0.3 },
        },
      ],
      data: { "yaw [deg]": [0.1, 0.2, 0.3] },
      preview: { rowNumbers: [2, 3, 4], cells: [["0.1"], ["0.2"], ["0.3"]] },
      rowNumbers: [2, 3, 4],
      file: Buffer.from("yaw [deg]\n0.1\n0.2\n0.3\n"),
      uploaderRole: "engineer",
    })
    .returning();
  lastDatasetRevision = revisionId;
  return d.id;
}
let lastDatasetRevision = "";
/** A report released to the supplier role's own company (Larkfield Assembly). */
async function freshReleasedReport(c: Ctx) {
  const projectId = await freshProject(c);
  const [r] = await c.t.handle.db
    .insert(reports)
    .values({
      workspaceId: c.workspaceId,
      projectId,
      supplierId: c.supplierId,
      number: 900_000 + ++counter,
      revision: 1,
      status: "released",
      capability: { cpk: 1.33, overrides: {} },
      content: emptyReportContent({ projectId, supplier: { id: c.supplierId, name: "Larkfield Assembly" } }),
      releasedAt: new Date(),
    })
    .returning();
  return r.id;
}
const MEASUREMENTS = { name: "first-build.csv", content: "unit,yaw [deg]\nU1,0.01\nU2,-0.02\n" };

/** A report for Larkfield on a project of its own (one draft per project and supplier). */
async function freshReport(c: Ctx, status: "draft" | "released" = "draft") {
  const f = await insertFinishedStudy(c.t.handle.db, { workspaceId: c.workspaceId });
  const r = await c.t.call("POST", `/api/studies/${f.studyId}/reports`, { cookie: cookies.engineer, body: { supplierId: c.supplierId } });
  if (r.status !== 201) throw new Error(`report fixture: ${JSON.stringify(r.body)}`);
  if (status === "released") {
    const rel = await c.t.call("POST", `/api/reports/${r.body.id}/release`, {
      cookie: cookies.reviewer,
      body: {},
      headers: { "if-match": r.headers.get("etag")! },
    });
    if (rel.status !== 200) throw new Error(`report fixture release: ${JSON.stringify(rel.body)}`);
  }
  return r.body.id as string;
}
let sharedReleased: Promise<string> | undefined;
const releasedReport = (c: Ctx) => (sharedReleased ??= freshReport(c, "released"));
async function freshOutboxMessage(c: Ctx) {
  const raw = Buffer.from(
    [
      "From: orthostack@localhost",
      "To: someone@example.com",
      "Subject: fixture",
      'Content-Type: multipart/mixed; boundary="b1"',
      "",
      "--b1",
      "Content-Type: text/plain",
      "",
      "hello",
      "--b1",
      'Content-Type: text/csv; name="a.csv"',
      'Content-Disposition: attachment; filename="a.csv"',
      "Content-Transfer-Encoding: base64",
      "",
      Buffer.from("a,b\n").toString("base64"),
      "--b1--",
      "",
    ].join("\r\n"),
  );
  const [m] = await c.t.handle.db
    .insert(outboxMessages)
    .values({
      workspaceId: c.workspaceId,
      mailFrom: "orthostack@localhost",
      recipients: ["someone@example.com"],
      subject: "fixture",
      size: raw.length,
      raw,
      attachments: [{ fileName: "a.csv", contentType: "text/csv", size: 4 }],
    })
    .returning();
  return m.id;
}

export const ROUTES: Row[] = [
  { route: "GET /api/health", allowed: "public" },
  {
    route: "GET /api/invitations/by-token/:token",
    allowed: "public",
    path: async (c) => `/api/invitations/by-token/${(await freshInvitation(c)).token}`,
  },
  {
    route: "POST /api/invitations/by-token/:token/accept",
    allowed: "public",
    path: async (c) => `/api/invitations/by-token/${(await freshInvitation(c)).token}/accept`,
    body: () => ({ name: "Invitee", password: "long-enough-password" }),
  },
  { route: "GET /api/me", allowed: EVERYONE },
  { route: "GET /api/projects", allowed: STAFF },
  { route: "POST /api/projects", allowed: WRITERS, body: () => ({ name: `new ${uniq()}` }) },
  { route: "GET /api/projects/:id", allowed: STAFF, path: async (c) => `/api/projects/${await freshProject(c)}` },
  {
    route: "PATCH /api/projects/:id",
    allowed: WRITERS,
    path: async (c) => `/api/projects/${await freshProject(c)}`,
    body: () => ({ name: `renamed ${uniq()}` }),
    version: 1,
  },
  { route: "DELETE /api/projects/:id", allowed: WRITERS, path: async (c) => `/api/projects/${await freshProject(c)}`, version: 1 },
  {
    route: "POST /api/projects/:id/archive",
    allowed: WRITERS,
    path: async (c) => `/api/projects/${await freshProject(c)}/archive`,
    version: 1,
  },
  {
    route: "POST /api/projects/:id/restore",
    allowed: WRITERS,
    path: async (c) => `/api/projects/${await freshProject(c, true)}/restore`,
    version: 1,
  },
  { route: "GET /api/projects/:id/activity", allowed: STAFF, path: async (c) => `/api/projects/${await freshProject(c)}/activity` },
  { route: "GET /api/suppliers", allowed: STAFF },
  { route: "GET /api/suppliers/:id", allowed: STAFF, path: (c) => `/api/suppliers/${c.supplierId}` },
  { route: "POST /api/suppliers", allowed: ADMIN, body: () => ({ name: `Supplier ${uniq()}`, kind: "die" }) },
  {
    route: "PATCH /api/suppliers/:id",
    allowed: ADMIN,
    path: async (c) => `/api/suppliers/${await freshSupplier(c)}`,
    body: () => ({ kind: "board" }),
    version: 1,
  },
  { route: "DELETE /api/suppliers/:id", allowed: ADMIN, path: async (c) => `/api/suppliers/${await freshSupplier(c)}`, version: 1 },
  {
    route: "POST /api/suppliers/:id/contacts",
    allowed: ADMIN,
    path: (c) => `/api/suppliers/${c.supplierId}/contacts`,
    body: () => ({ name: "Kit", email: `${uniq()}@k.example` }),
  },
  {
    route: "DELETE /api/suppliers/:id/contacts/:contactId",
    allowed: ADMIN,
    path: async (c) => {
      // a supplier of its own: the shared one's version moves with the other rows' contacts
      const supplierId = await freshSupplier(c);
      return `/api/suppliers/${supplierId}/contacts/${await freshContact(c, supplierId)}`;
    },
    version: 1,
  },
  { route: "GET /api/members", allowed: ADMIN },
  { route: "GET /api/status", allowed: ADMIN },
  {
    route: "PATCH /api/members/:id",
    allowed: ADMIN,
    path: async (c) => `/api/members/${await freshMember(c)}`,
    body: () => ({ role: "reviewer" }),
  },
  { route: "DELETE /api/members/:id", allowed: ADMIN, path: async (c) => `/api/members/${await freshMember(c)}` },
  { route: "POST /api/members/:id/reset-link", allowed: ADMIN, path: async (c) => `/api/members/${await freshMember(c)}/reset-link` },
  { route: "GET /api/invitations", allowed: ADMIN },
  { route: "POST /api/invitations", allowed: ADMIN, body: () => ({ email: `${uniq()}@new.example`, role: "engineer" }) },
  { route: "DELETE /api/invitations/:id", allowed: ADMIN, path: async (c) => `/api/invitations/${(await freshInvitation(c)).id}` },
  { route: "GET /api/projects/:id/revisions", allowed: STAFF, path: async (c) => `/api/projects/${await freshProject(c)}/revisions` },
  {
    route: "POST /api/projects/:id/revisions",
    allowed: WRITERS,
    path: async (c) => `/api/projects/${await freshProject(c)}/revisions`,
    body: () => ({ stack: REFERENCE }),
  },
  { route: "GET /api/revisions/:id", allowed: STAFF, path: async (c) => `/api/revisions/${await freshRevision(c)}` },
  {
    route: "PATCH /api/revisions/:id",
    allowed: WRITERS,
    path: async (c) => `/api/revisions/${await freshRevision(c)}`,
    body: () => ({ note: "changed" }),
    version: 1,
  },
  {
    route: "POST /api/revisions/:id/drafts",
    allowed: WRITERS,
    path: async (c) => `/api/revisions/${await freshRevision(c, "approved")}/drafts`,
  },
  {
    route: "POST /api/revisions/:id/submit",
    allowed: WRITERS,
    path: async (c) => `/api/revisions/${await freshRevision(c)}/submit`,
    version: 1,
  },
  {
    route: "POST /api/revisions/:id/approve",
    allowed: REVIEWERS,
    path: async (c) => `/api/revisions/${await freshRevision(c, "in_review")}/approve`,
    version: 1,
  },
  {
    route: "POST /api/revisions/:id/return",
    allowed: REVIEWERS,
    path: async (c) => `/api/revisions/${await freshRevision(c, "in_review")}/return`,
    body: () => ({ comment: "please fix" }),
    version: 1,
  },
  {
    route: "POST /api/revisions/:id/comments",
    allowed: STAFF,
    path: async (c) => `/api/revisions/${await freshRevision(c)}/comments`,
    body: () => ({ body: "looks fine" }),
  },
  { route: "GET /api/revisions/:id/diff", allowed: STAFF, path: async (c) => `/api/revisions/${await freshRevision(c)}/diff` },
  {
    route: "GET /api/revisions/:id/requirement-check",
    allowed: STAFF,
    path: async (c) => `/api/revisions/${await freshRevision(c)}/requirement-check`,
  },
  { route: "GET /api/revisions/:id/stack-file", allowed: STAFF, path: async (c) => `/api/revisions/${await freshRevision(c)}/stack-file` },
  { route: "GET /api/projects/:id/studies", allowed: STAFF, path: async (c) => `/api/projects/${await freshProject(c)}/studies` },
  {
    route: "POST /api/revisions/:id/studies",
    allowed: WRITERS,
    path: async (c) => `/api/revisions/${await freshRevision(c)}/studies`,
    body: () => ({ study: STUDY }),
  },
  { route: "GET /api/workspace/study-budget", allowed: WRITERS },
  // the default again, so the other rows' studies stay within it
  { route: "PATCH /api/workspace/study-budget", allowed: ADMIN, body: () => ({ budget: 2_000_000_000 }) },
  { route: "GET /api/studies/:id", allowed: STAFF, path: async (c) => `/api/studies/${await freshStudy(c)}` },
  {
    route: "GET /api/studies/:id/export",
    allowed: STAFF,
    path: async (c) =>
      `/api/studies/${(await insertFinishedStudy(c.t.handle.db, { workspaceId: c.workspaceId })).studyId}/export?format=csv`,
  },
  { route: "POST /api/studies/:id/cancel", allowed: WRITERS, path: async (c) => `/api/studies/${await freshStudy(c)}/cancel` },
  { route: "POST /api/studies/:id/rerun", allowed: WRITERS, path: async (c) => `/api/studies/${await freshStudy(c, "failed")}/rerun` },
  {
    route: "POST /api/revisions/:id/sweeps",
    allowed: WRITERS,
    path: async (c) => `/api/revisions/${await freshRevision(c)}/sweeps`,
    body: () => ({ study: STUDY, parameter: "mag.axis", values: [0.3, 0.6] }),
  },
  { route: "GET /api/sweeps/:id", allowed: STAFF, path: async (c) => `/api/sweeps/${await freshWhatIf(c, "sweep")}` },
  // "running" as another process would have it: the queue here leaves it alone, the cancel stops it
  {
    route: "POST /api/sweeps/:id/cancel",
    allowed: WRITERS,
    path: async (c) => `/api/sweeps/${await freshWhatIf(c, "sweep", "running")}/cancel`,
  },
  {
    route: "POST /api/revisions/:id/allocations",
    allowed: WRITERS,
    path: async (c) => `/api/revisions/${await freshRevision(c)}/allocations`,
    body: () => ({ study: STUDY, free: ["mag.axis"] }),
  },
  { route: "GET /api/allocations/:id", allowed: STAFF, path: async (c) => `/api/allocations/${await freshWhatIf(c, "allocation")}` },
  {
    route: "POST /api/allocations/:id/cancel",
    allowed: WRITERS,
    path: async (c) => `/api/allocations/${await freshWhatIf(c, "allocation", "running")}/cancel`,
  },
  {
    route: "POST /api/allocations/:id/apply",
    allowed: WRITERS,
    path: async (c) => `/api/allocations/${await freshWhatIf(c, "allocation")}/apply`,
  },
  { route: "GET /api/inclination-grid", allowed: STAFF, path: () => "/api/inclination-grid?date=2026-06-01&stepDeg=10" },
  {
    route: "GET /api/geomagnetic-field",
    allowed: STAFF,
    path: () => "/api/geomagnetic-field?latitudeDeg=52&longitudeDeg=-1&altitudeKm=0&date=2026-06-01",
  },
  { route: "GET /api/typical-tolerances", allowed: STAFF },
  { route: "GET /api/stack-templates", allowed: STAFF },
  {
    route: "GET /api/projects/:id/report-options",
    allowed: STAFF,
    path: async (c) => `/api/projects/${await freshProject(c)}/report-options`,
  },
  {
    route: "POST /api/studies/:id/reports",
    allowed: WRITERS,
    path: async (c) => `/api/studies/${(await insertFinishedStudy(c.t.handle.db, { workspaceId: c.workspaceId })).studyId}/reports`,
    body: (c) => ({ supplierId: c.supplierId }),
  },
  { route: "GET /api/reports", allowed: EVERYONE },
  { route: "GET /api/reports/:id", allowed: EVERYONE, path: async (c) => `/api/reports/${await releasedReport(c)}` },
  {
    route: "PATCH /api/reports/:id",
    allowed: WRITERS,
    path: async (c) => `/api/reports/${await freshReport(c)}`,
    body: () => ({ note: "changed" }),
    version: 1,
  },
  { route: "DELETE /api/reports/:id", allowed: WRITERS, path: async (c) => `/api/reports/${await freshReport(c)}`, version: 1 },
  {
    route: "POST /api/reports/:id/release",
    allowed: REVIEWERS,
    path: async (c) => `/api/reports/${await freshReport(c)}/release`,
    version: 1,
  },
  {
    route: "POST /api/reports/:id/return",
    allowed: REVIEWERS,
    path: async (c) => `/api/reports/${await freshReport(c)}/return`,
    body: () => ({ comment: "Ask Cpk 1.67 on the mag yaw." }),
    version: 1,
  },
  { route: "POST /api/reports/:id/send", allowed: STAFF, path: async (c) => `/api/reports/${await releasedReport(c)}/send` },
  {
    route: "POST /api/reports/:id/acknowledge",
    allowed: ["supplier"],
    path: async (c) => `/api/reports/${await freshReport(c, "released")}/acknowledge`,
    version: 2,
  },
  {
    route: "POST /api/reports/:id/comments",
    allowed: EVERYONE,
    path: async (c) => `/api/reports/${await releasedReport(c)}/comments`,
    body: () => ({ body: "Which side is the datum?" }),
  },
  { route: "GET /api/reports/:id/pdf", allowed: EVERYONE, path: async (c) => `/api/reports/${await releasedReport(c)}/pdf` },
  { route: "GET /api/reports/:id/xlsx", allowed: EVERYONE, path: async (c) => `/api/reports/${await releasedReport(c)}/xlsx` },
  { route: "GET /api/reports/:id/csv", allowed: EVERYONE, path: async (c) => `/api/reports/${await releasedReport(c)}/csv` },
  { route: "GET /api/outbox", allowed: ADMIN },
  {
    route: "GET /api/outbox/:id/attachments/:index",
    allowed: ADMIN,
    path: async (c) => `/api/outbox/${await freshOutboxMessage(c)}/attachments/0`,
  },
  { route: "GET /api/projects/:id/datasets", allowed: STAFF, path: async (c) => `/api/projects/${await freshProject(c)}/datasets` },
  {
    route: "POST /api/projects/:id/datasets",
    allowed: WRITERS,
    path: async (c) => `/api/projects/${await freshProject(c)}/datasets`,
    upload: MEASUREMENTS,
  },
  { route: "GET /api/datasets/:id", allowed: STAFF, path: async (c) => `/api/datasets/${await freshDataset(c)}` },
  { route: "DELETE /api/datasets/:id", allowed: WRITERS, path: async (c) => `/api/datasets/${await freshDataset(c)}`, version: 1 },
  {
    route: "PATCH /api/datasets/:id",
    allowed: WRITERS,
    path: async (c) => `/api/datasets/${await freshDataset(c)}`,
    body: () => ({ lotColumn: null }),
    version: 1,
  },
  {
    route: "PATCH /api/datasets/:id/mappings",
    allowed: WRITERS,
    path: async (c) => `/api/datasets/${await freshDataset(c)}/mappings`,
    body: () => ({ mappings: [{ column: "yaw [deg]", revisionId: lastDatasetRevision, source: "mag.yaw" }] }),
    version: 1,
  },
  {
    route: "GET /api/datasets/:id/statistics",
    allowed: STAFF,
    path: async (c) => `/api/datasets/${await freshDataset(c)}/statistics?column=${encodeURIComponent("yaw [deg]")}`,
  },
  { route: "GET /api/datasets/:id/file", allowed: STAFF, path: async (c) => `/api/datasets/${await freshDataset(c)}/file` },
  // a supplier only through a released report of its own company (other companies' reports: tests/backend/datasets.test.ts)
  { route: "GET /api/reports/:id/datasets", allowed: EVERYONE, path: async (c) => `/api/reports/${await freshReleasedReport(c)}/datasets` },
  {
    route: "POST /api/reports/:id/datasets",
    allowed: ["admin", "engineer", "supplier"],
    path: async (c) => `/api/reports/${await freshReleasedReport(c)}/datasets`,
    upload: MEASUREMENTS,
  },
  { route: "GET /api/notifications", allowed: EVERYONE },
  { route: "POST /api/notifications/read", allowed: EVERYONE, body: () => ({}) },
  { route: "GET /api/notification-settings", allowed: EVERYONE },
  { route: "PUT /api/notification-settings", allowed: EVERYONE, body: () => ({ email: { "report.sent": false } }) },
  { route: "GET /api/review-queue", allowed: STAFF },
];

let t: TestApp;
let ctx: Ctx;
const cookies: Partial<Record<Who, string>> = {};

beforeAll(async () => {
  // studies in this table never finish: they wait until cancelled
  t = await startTestApp({
    runner: (_input, { signal }) =>
      new Promise((_resolve, reject) => signal.addEventListener("abort", () => reject(new Error("cancelled")))),
  });
  for (const role of EVERYONE) cookies[role] = await t.signIn(`${role}@example.com`);
  const [s] = await t.handle.db.select().from(suppliers).where(eq(suppliers.name, "Larkfield Assembly"));
  ctx = { t, workspaceId: s.workspaceId, supplierId: s.id };
});
afterAll(() => t?.close());

describe("role table", () => {
  it("covers every registered API route, and only those", () => {
    const app = createApp(t.deps);
    expect(ROUTES.map((r) => r.route).sort()).toEqual(registeredApiRoutes(app));
  });

  for (const row of ROUTES) {
    for (const who of WHO) {
      const expected = row.allowed === "public" ? "allowed" : who === "nobody" ? 401 : row.allowed.includes(who) ? "allowed" : 403;
      it(`${row.route} as ${who} → ${expected}`, async () => {
        const [method, template] = row.route.split(" ");
        const path = row.path ? await row.path(ctx) : template;
        const body = row.body?.(ctx) ?? (method === "GET" || method === "DELETE" ? undefined : {});
        const cookie = who === "nobody" ? undefined : cookies[who];
        const res = row.upload
          ? await t.call(method, path, { cookie, ...multipart(row.upload) })
          : await t.call(method, path, { cookie, body, headers: row.version ? { "if-match": `"${row.version}"` } : undefined });
        if (expected === "allowed") {
          expect(res.status, JSON.stringify(res.body)).toBeLessThan(400);
        } else {
          expect(res.status).toBe(expected);
          expect(res.body.error.code).toBe(expected === 401 ? "unauthenticated" : "forbidden");
        }
      });
    }
  }
});

function multipart(file: { name: string; content: string }) {
  const boundary = `----orthostack-${uniq()}`;
  const raw = `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="${file.name}"\r\nContent-Type: text/csv\r\n\r\n${file.content}\r\n--${boundary}--\r\n`;
  return { raw, headers: { "content-type": `multipart/form-data; boundary=${boundary}` } };
}
