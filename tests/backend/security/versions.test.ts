/**
 * Issue 10, item 4: no silent lost update. Two engineers editing one draft: the second save used
 * to overwrite the first without a word. Every shared record (revision, project, report, data set,
 * supplier) now carries a version and an ETag; a change names the version it was made on
 * (If-Match or `version` in the body): a stale one is a 409 `conflict` with the current version,
 * none at all a 428, and a successful change adds one to the version.
 */
import { readFileSync } from "node:fs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { datasets, projects, reports, stackRevisions, suppliers } from "@backend/db/schema";
import { startTestApp, type TestApp } from "../harness";
import { insertFinishedStudy, LARKFIELD } from "../report-fixtures";

const REFERENCE = JSON.parse(readFileSync(new URL("../../fixtures/stack-reference.json", import.meta.url), "utf8"));

let t: TestApp;
const c: Record<string, string> = {};
let workspaceId: string;
let larkfield: string;

beforeAll(async () => {
  t = await startTestApp();
  for (const role of ["admin", "engineer", "reviewer", "supplier"]) c[role] = await t.signIn(`${role}@example.com`);
  const [s] = await t.handle.db.select().from(suppliers).where(eq(suppliers.name, LARKFIELD));
  workspaceId = s.workspaceId;
  larkfield = s.id;
});
afterAll(() => t?.close());

let n = 0;
const uniq = () => `${Date.now().toString(36)}-${++n}`;
const tag = (v: number) => ({ "if-match": `"${v}"` });

async function newProject() {
  const p = await t.call("POST", "/api/projects", { cookie: c.engineer, body: { name: `Versions ${uniq()}` } });
  expect(p.status).toBe(201);
  return p.body.id as string;
}
async function newRevision(projectId?: string) {
  const r = await t.call("POST", `/api/projects/${projectId ?? (await newProject())}/revisions`, {
    cookie: c.engineer,
    body: { stack: REFERENCE },
  });
  expect(r.status).toBe(201);
  return r.body.id as string;
}
async function newReport() {
  const f = await insertFinishedStudy(t.handle.db, { workspaceId });
  const r = await t.call("POST", `/api/studies/${f.studyId}/reports`, { cookie: c.engineer, body: { supplierId: larkfield } });
  expect(r.status, JSON.stringify(r.body)).toBe(201);
  return r.body.id as string;
}
async function newDataset() {
  const projectId = await newProject();
  const revisionId = await newRevision(projectId);
  const form = new FormData();
  form.append("file", new Blob([Buffer.from("unit,lot,yaw [deg]\nU1,A,0.01\nU2,A,-0.02\nU3,B,0.03\n")]), "yaw.csv");
  const res = await fetch(`${t.url}/api/projects/${projectId}/datasets`, {
    method: "POST",
    headers: { origin: t.deps.baseURL, cookie: c.engineer },
    body: form,
  });
  expect(res.status).toBe(201);
  return { id: ((await res.json()) as { id: string }).id, revisionId };
}
async function newSupplier() {
  const s = await t.call("POST", "/api/suppliers", { cookie: c.admin, body: { name: `Supplier ${uniq()}`, kind: "die" } });
  expect(s.status).toBe(201);
  return s.body.id as string;
}

/** The stored version, read past the API. */
const stored = {
  revision: async (id: string) => (await t.handle.db.select().from(stackRevisions).where(eq(stackRevisions.id, id)))[0],
  project: async (id: string) => (await t.handle.db.select().from(projects).where(eq(projects.id, id)))[0],
  report: async (id: string) => (await t.handle.db.select().from(reports).where(eq(reports.id, id)))[0],
  dataset: async (id: string) => (await t.handle.db.select().from(datasets).where(eq(datasets.id, id)))[0],
  supplier: async (id: string) => (await t.handle.db.select().from(suppliers).where(eq(suppliers.id, id)))[0],
};

type Kind = {
  kind: keyof typeof stored;
  /** a fresh record: its GET path, the change's method and path, who makes it, and two different changes */
  make: () => Promise<{ id: string; read: string; method: string; write: string; cookie: string; first: unknown; second: unknown }>;
  /** what the second change left in the stored row (to show the stale one changed nothing) */
  changed: (row: any) => unknown;
};

const PATCHES: Kind[] = [
  {
    kind: "revision",
    make: async () => {
      const id = await newRevision();
      const path = `/api/revisions/${id}`;
      return { id, read: path, method: "PATCH", write: path, cookie: c.engineer, first: { note: "first" }, second: { note: "second" } };
    },
    changed: (row) => row.note,
  },
  {
    kind: "project",
    make: async () => {
      const id = await newProject();
      const path = `/api/projects/${id}`;
      return {
        id,
        read: path,
        method: "PATCH",
        write: path,
        cookie: c.engineer,
        first: { name: `A ${uniq()}` },
        second: { name: `B ${uniq()}` },
      };
    },
    changed: (row) => row.name,
  },
  {
    kind: "report",
    make: async () => {
      const id = await newReport();
      const path = `/api/reports/${id}`;
      return { id, read: path, method: "PATCH", write: path, cookie: c.engineer, first: { note: "first" }, second: { note: "second" } };
    },
    changed: (row) => row.note,
  },
  {
    kind: "dataset",
    make: async () => {
      const { id } = await newDataset();
      const path = `/api/datasets/${id}`;
      return { id, read: path, method: "PATCH", write: path, cookie: c.engineer, first: { lotColumn: "lot" }, second: { lotColumn: null } };
    },
    changed: (row) => row.lotColumn,
  },
  {
    kind: "dataset",
    make: async () => {
      const { id, revisionId } = await newDataset();
      const map = (source: string | null) => ({ mappings: [{ column: "yaw [deg]", revisionId, source }] });
      return {
        id,
        read: `/api/datasets/${id}`,
        method: "PATCH",
        write: `/api/datasets/${id}/mappings`,
        cookie: c.engineer,
        first: map("mag.yaw"),
        second: map(null),
      };
    },
    changed: (row) => row.version,
  },
  {
    kind: "supplier",
    make: async () => {
      const id = await newSupplier();
      const path = `/api/suppliers/${id}`;
      return { id, read: path, method: "PATCH", write: path, cookie: c.admin, first: { kind: "board" }, second: { kind: "substrate" } };
    },
    changed: (row) => row.kind,
  },
];

describe("every shared record carries its version", () => {
  it.each(PATCHES.map((k) => [k.kind, k] as const))("%s: GET gives the version in the body and as ETag", async (_name, k) => {
    const r = await k.make();
    const res = await t.call("GET", r.read, { cookie: r.cookie });
    expect(res.status).toBe(200);
    expect(res.body.version).toBe(1);
    expect(res.headers.get("etag")).toBe('"1"');
    // the ETag names the edit counter only: a browser must not answer from a stored copy
    expect(res.headers.get("cache-control")).toMatch(/no-store/);
  });
});

describe("PATCH names the version it was made on", () => {
  for (const k of PATCHES) {
    const label = `${k.kind} (${k === PATCHES[4] ? "column mappings" : "PATCH"})`;

    it(`${label}: no version at all → 428, nothing changed`, async () => {
      const r = await k.make();
      const before = await stored[k.kind](r.id);
      const res = await t.call(r.method, r.write, { cookie: r.cookie, body: r.first });
      expect(res.status).toBe(428);
      expect(res.body.error.code).toBe("precondition_required");
      expect(await stored[k.kind](r.id)).toEqual(before);
    });

    it(`${label}: the current version → 200, one more, in the body and the ETag`, async () => {
      const r = await k.make();
      const res = await t.call(r.method, r.write, { cookie: r.cookie, body: r.first, headers: await t.ifMatch(r.read, r.cookie) });
      expect(res.status, JSON.stringify(res.body)).toBe(200);
      expect(res.body.version).toBe(2);
      expect(res.headers.get("etag")).toBe('"2"');
      expect((await stored[k.kind](r.id)).version).toBe(2);
      // the version may come in the body instead of the header
      const again = await t.call(r.method, r.write, { cookie: r.cookie, body: { ...(r.second as object), version: 2 } });
      expect(again.status, JSON.stringify(again.body)).toBe(200);
      expect(again.body.version).toBe(3);
    });

    it(`${label}: a stale version → 409 conflict with the current version, the other edit kept`, async () => {
      const r = await k.make();
      const first = await t.ifMatch(r.read, r.cookie);
      const second = await t.ifMatch(r.read, r.cookie); // a second person loads the same version
      expect((await t.call(r.method, r.write, { cookie: r.cookie, body: r.first, headers: first })).status).toBe(200);
      const kept = await stored[k.kind](r.id);
      const stale = await t.call(r.method, r.write, { cookie: r.cookie, body: r.second, headers: second });
      expect(stale.status).toBe(409);
      expect(stale.body.error.code).toBe("conflict");
      expect(stale.body.error.version).toBe(2);
      expect(stale.body.error.message).toMatch(/changed by someone else/);
      expect(k.changed(await stored[k.kind](r.id))).toEqual(k.changed(kept));
      expect((await stored[k.kind](r.id)).version).toBe(2);
    });
  }

  it("two saves on one version at the same moment: exactly one is taken", async () => {
    const id = await newRevision();
    const headers = tag(1);
    const [a, b] = await Promise.all([
      t.call("PATCH", `/api/revisions/${id}`, { cookie: c.engineer, body: { note: "from A" }, headers }),
      t.call("PATCH", `/api/revisions/${id}`, { cookie: c.admin, body: { note: "from B" }, headers }),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 409]);
    const row = await stored.revision(id);
    expect(row.version).toBe(2);
    expect(row.note).toBe(a.status === 200 ? "from A" : "from B");
  });

  it("refuses an If-Match that names no single version, and one that disagrees with the body", async () => {
    const id = await newRevision();
    for (const bad of ["*", '"1", "2"', '"x"', '"0"', ""]) {
      const res = await t.call("PATCH", `/api/revisions/${id}`, { cookie: c.engineer, body: { note: "x" }, headers: { "if-match": bad } });
      expect(res.status, bad).toBe(400);
      expect(res.body.error.fields[0].path).toMatch(/If-Match/);
    }
    const both = await t.call("PATCH", `/api/revisions/${id}`, { cookie: c.engineer, body: { note: "x", version: 2 }, headers: tag(1) });
    expect(both.status).toBe(400);
    expect(both.body.error.fields[0].path).toBe("version");
    const badBody = await t.call("PATCH", `/api/revisions/${id}`, { cookie: c.engineer, body: { note: "x", version: "1" } });
    expect(badBody.status).toBe(400);
    expect(badBody.body.error.fields[0].path).toBe("version");
    expect((await stored.revision(id)).version).toBe(1);
    // a weak tag is read as the same version
    expect(
      (await t.call("PATCH", `/api/revisions/${id}`, { cookie: c.engineer, body: { note: "x" }, headers: { "if-match": 'W/"1"' } })).status,
    ).toBe(200);
  });
});

describe("review actions name the version they were made on", () => {
  type Action = {
    name: string;
    setup: () => Promise<{ id: string; read: string; write: string; cookie: string; body: unknown }>;
    status: (row: any) => unknown;
    kind: keyof typeof stored;
  };
  const ACTIONS: Action[] = [
    {
      name: "revision submit",
      kind: "revision",
      setup: async () => {
        const id = await newRevision();
        return {
          id,
          read: `/api/revisions/${id}`,
          write: `/api/revisions/${id}/submit`,
          cookie: c.engineer,
          body: { note: "first build" },
        };
      },
      status: (row) => row.status,
    },
    {
      name: "revision approve",
      kind: "revision",
      setup: async () => {
        const id = await newRevision();
        await t.call("POST", `/api/revisions/${id}/submit`, { cookie: c.engineer, body: { note: "n", version: 1 } });
        return { id, read: `/api/revisions/${id}`, write: `/api/revisions/${id}/approve`, cookie: c.reviewer, body: {} };
      },
      status: (row) => row.status,
    },
    {
      name: "revision return",
      kind: "revision",
      setup: async () => {
        const id = await newRevision();
        await t.call("POST", `/api/revisions/${id}/submit`, { cookie: c.engineer, body: { note: "n", version: 1 } });
        return {
          id,
          read: `/api/revisions/${id}`,
          write: `/api/revisions/${id}/return`,
          cookie: c.reviewer,
          body: { comment: "fix the yaw" },
        };
      },
      status: (row) => row.status,
    },
    {
      name: "report release",
      kind: "report",
      setup: async () => {
        const id = await newReport();
        return { id, read: `/api/reports/${id}`, write: `/api/reports/${id}/release`, cookie: c.reviewer, body: {} };
      },
      status: (row) => row.status,
    },
    {
      name: "report return",
      kind: "report",
      setup: async () => {
        const id = await newReport();
        return { id, read: `/api/reports/${id}`, write: `/api/reports/${id}/return`, cookie: c.reviewer, body: { comment: "Cpk 1.67" } };
      },
      status: (row) => row.version,
    },
    {
      name: "report acknowledge",
      kind: "report",
      setup: async () => {
        const id = await newReport();
        expect((await t.call("POST", `/api/reports/${id}/release`, { cookie: c.reviewer, body: { version: 1 } })).status).toBe(200);
        return { id, read: `/api/reports/${id}`, write: `/api/reports/${id}/acknowledge`, cookie: c.supplier, body: {} };
      },
      status: (row) => row.acknowledgedAt,
    },
  ];

  for (const a of ACTIONS) {
    it(`${a.name}: none → 428, stale → 409 with the current version, current → done and one more`, async () => {
      const r = await a.setup();
      const before = await stored[a.kind](r.id);
      const none = await t.call("POST", r.write, { cookie: r.cookie, body: r.body });
      expect(none.status).toBe(428);
      expect(none.body.error.code).toBe("precondition_required");
      expect(await stored[a.kind](r.id)).toEqual(before);

      const current = before.version;
      const stale = await t.call("POST", r.write, { cookie: r.cookie, body: r.body, headers: tag(current - 1 || current + 1) });
      expect(stale.status).toBe(409);
      expect(stale.body.error).toMatchObject({ code: "conflict", version: current });
      expect(await stored[a.kind](r.id)).toEqual(before);

      const ok = await t.call("POST", r.write, { cookie: r.cookie, body: r.body, headers: await t.ifMatch(r.read, r.cookie) });
      expect(ok.status, JSON.stringify(ok.body)).toBe(200);
      expect(ok.body.version).toBe(current + 1);
      expect(ok.headers.get("etag")).toBe(`"${current + 1}"`);
      const after = await stored[a.kind](r.id);
      expect(after.version).toBe(current + 1);
      expect(a.status(after)).not.toEqual(a.status(before));
    });
  }

  it("an edit made on the draft before it was submitted is refused, not applied to the revision in review", async () => {
    const id = await newRevision();
    const engineerB = await t.ifMatch(`/api/revisions/${id}`, c.admin);
    expect((await t.call("POST", `/api/revisions/${id}/submit`, { cookie: c.engineer, body: { note: "n" }, headers: tag(1) })).status).toBe(
      200,
    );
    const late = await t.call("PATCH", `/api/revisions/${id}`, { cookie: c.admin, body: { note: "late edit" }, headers: engineerB });
    expect(late.status).toBe(409);
    expect(late.body.error).toMatchObject({ code: "conflict", version: 2 });
    expect((await stored.revision(id)).note).toBe("n");
  });
});

describe("other changes of a shared record count as changes", () => {
  it("archiving a project adds one to its version (a rename on the version before is refused)", async () => {
    const id = await newProject();
    const stale = await t.call("POST", `/api/projects/${id}/archive`, { cookie: c.engineer, headers: tag(5) });
    expect(stale.status).toBe(409);
    const archived = await t.call("POST", `/api/projects/${id}/archive`, { cookie: c.engineer, headers: tag(1) });
    expect(archived.status).toBe(200);
    expect(archived.body.version).toBe(2);
    const restored = await t.call("POST", `/api/projects/${id}/restore`, { cookie: c.engineer, headers: tag(2) });
    expect(restored.body.version).toBe(3);
    const rename = await t.call("PATCH", `/api/projects/${id}`, { cookie: c.engineer, body: { name: "late" }, headers: tag(1) });
    expect(rename.status).toBe(409);
    expect(rename.body.error.version).toBe(3);
  });

  it("adding and removing a supplier's contact adds one to the supplier's version", async () => {
    const id = await newSupplier();
    const added = await t.call("POST", `/api/suppliers/${id}/contacts`, {
      cookie: c.admin,
      body: { name: "Kit", email: `${uniq()}@k.example` },
    });
    expect(added.status).toBe(201);
    expect((await stored.supplier(id)).version).toBe(2);
    const stale = await t.call("DELETE", `/api/suppliers/${id}/contacts/${added.body.id}`, { cookie: c.admin, headers: tag(1) });
    expect(stale.status).toBe(409);
    expect((await t.call("DELETE", `/api/suppliers/${id}/contacts/${added.body.id}`, { cookie: c.admin, headers: tag(2) })).status).toBe(
      204,
    );
    expect((await stored.supplier(id)).version).toBe(3);
  });
});
