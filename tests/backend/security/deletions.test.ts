/**
 * Issue 10, item 4, the rest of it: a deletion (and an archive or restore, which carry no body)
 * of a shared record names the version it was made on, like an edit does. Without one it is a
 * 428; on a version someone else's change has since moved past it is a 409 `conflict` with the
 * current version, and the record is left as it was; on the current one it goes through.
 * backend/lib/versions.ts (deleteVersioned, requireVersion), docs/decisions/034-record-versions.md
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { datasets, projects, reports, studies, supplierContacts, suppliers } from "@backend/db/schema";
import { startTestApp, type TestApp } from "../harness";
import { insertFinishedStudy, LARKFIELD } from "../report-fixtures";

let t: TestApp;
const c: Record<string, string> = {};
let workspaceId: string;
let larkfield: string;

beforeAll(async () => {
  // a study run again here never runs: it waits until the app closes
  t = await startTestApp({
    runner: (_input, { signal }) =>
      new Promise((_resolve, reject) => signal.addEventListener("abort", () => reject(new Error("cancelled")))),
  });
  for (const role of ["admin", "engineer"]) c[role] = await t.signIn(`${role}@example.com`);
  const [s] = await t.handle.db.select().from(suppliers).where(eq(suppliers.name, LARKFIELD));
  workspaceId = s.workspaceId;
  larkfield = s.id;
});
afterAll(() => t?.close());

let n = 0;
const uniq = () => `${Date.now().toString(36)}-${++n}`;
const tag = (v: number) => ({ "if-match": `"${v}"` });

/** Someone else's change, made with the version it read; returns the new version. */
async function change(method: string, path: string, cookie: string, body: unknown, version: number) {
  const res = await t.call(method, path, { cookie, body, headers: tag(version) });
  expect(res.status, JSON.stringify(res.body)).toBeLessThan(300);
  return res.body.version as number;
}

async function newProject() {
  const p = await t.call("POST", "/api/projects", { cookie: c.engineer, body: { name: `Deletions ${uniq()}` } });
  expect(p.status).toBe(201);
  return p.body.id as string;
}
async function newSupplier() {
  const s = await t.call("POST", "/api/suppliers", { cookie: c.admin, body: { name: `Supplier ${uniq()}`, kind: "die" } });
  expect(s.status).toBe(201);
  return s.body.id as string;
}

const row = {
  project: async (id: string) => (await t.handle.db.select().from(projects).where(eq(projects.id, id)))[0],
  supplier: async (id: string) => (await t.handle.db.select().from(suppliers).where(eq(suppliers.id, id)))[0],
  contact: async (id: string) => (await t.handle.db.select().from(supplierContacts).where(eq(supplierContacts.id, id)))[0],
  dataset: async (id: string) => (await t.handle.db.select().from(datasets).where(eq(datasets.id, id)))[0],
  report: async (id: string) => (await t.handle.db.select().from(reports).where(eq(reports.id, id)))[0],
};

type Case = {
  /** the route family, as the role table names it */
  route: string;
  /**
   * A fresh record someone else has changed once since version `stale` was read: the call's
   * path, who makes it, the versions, and what of the stored record the call changes.
   */
  make: () => Promise<{ path: string; cookie: string; stale: number; current: number; state: () => Promise<unknown> }>;
  /** the answer and the state once the call is made on the current version */
  done: { status: number; state: (before: unknown) => unknown };
};

const CASES: Case[] = [
  {
    route: "DELETE /api/projects/:id",
    make: async () => {
      const id = await newProject();
      const current = await change("PATCH", `/api/projects/${id}`, c.engineer, { description: "theirs" }, 1);
      return { path: `/api/projects/${id}`, cookie: c.engineer, stale: 1, current, state: () => row.project(id) };
    },
    done: { status: 204, state: () => undefined },
  },
  {
    route: "POST /api/projects/:id/archive",
    make: async () => {
      const id = await newProject();
      const current = await change("PATCH", `/api/projects/${id}`, c.engineer, { description: "theirs" }, 1);
      return {
        path: `/api/projects/${id}/archive`,
        cookie: c.engineer,
        stale: 1,
        current,
        state: async () => (await row.project(id)).archivedAt,
      };
    },
    done: { status: 200, state: () => expect.any(Date) },
  },
  {
    route: "POST /api/projects/:id/restore",
    make: async () => {
      const id = await newProject();
      // the other person archived it: the page still shows it open, at version 1
      const current = await change("POST", `/api/projects/${id}/archive`, c.engineer, {}, 1);
      return {
        path: `/api/projects/${id}/restore`,
        cookie: c.engineer,
        stale: 1,
        current,
        state: async () => (await row.project(id)).archivedAt,
      };
    },
    done: { status: 200, state: () => null },
  },
  {
    route: "DELETE /api/suppliers/:id",
    make: async () => {
      const id = await newSupplier();
      const current = await change("PATCH", `/api/suppliers/${id}`, c.admin, { kind: "board" }, 1);
      return { path: `/api/suppliers/${id}`, cookie: c.admin, stale: 1, current, state: () => row.supplier(id) };
    },
    done: { status: 204, state: () => undefined },
  },
  {
    route: "DELETE /api/suppliers/:id/contacts/:contactId",
    make: async () => {
      const id = await newSupplier();
      const kit = await t.call("POST", `/api/suppliers/${id}/contacts`, {
        cookie: c.admin,
        body: { name: "Kit", email: `${uniq()}@k.example` },
        headers: tag(1),
      });
      expect(kit.status).toBe(201);
      // someone else adds a second contact: the card that lists Kit is now at a stale version
      const lou = await t.call("POST", `/api/suppliers/${id}/contacts`, {
        cookie: c.admin,
        body: { name: "Lou", email: `${uniq()}@l.example` },
        headers: tag(2),
      });
      expect(lou.status).toBe(201);
      return {
        path: `/api/suppliers/${id}/contacts/${kit.body.id}`,
        cookie: c.admin,
        stale: 2,
        current: (await row.supplier(id)).version,
        state: () => row.contact(kit.body.id),
      };
    },
    done: { status: 204, state: () => undefined },
  },
  {
    route: "DELETE /api/datasets/:id",
    make: async () => {
      const projectId = await newProject();
      const form = new FormData();
      form.append("file", new Blob([Buffer.from("unit,lot,yaw [deg]\nU1,A,0.01\nU2,A,-0.02\nU3,B,0.03\n")]), "yaw.csv");
      const res = await fetch(`${t.url}/api/projects/${projectId}/datasets`, {
        method: "POST",
        headers: { origin: t.deps.baseURL, cookie: c.engineer },
        body: form,
      });
      expect(res.status).toBe(201);
      const { id } = (await res.json()) as { id: string };
      const current = await change("PATCH", `/api/datasets/${id}`, c.engineer, { lotColumn: "lot" }, 1);
      return { path: `/api/datasets/${id}`, cookie: c.engineer, stale: 1, current, state: () => row.dataset(id) };
    },
    done: { status: 204, state: () => undefined },
  },
  {
    route: "DELETE /api/reports/:id",
    make: async () => {
      const f = await insertFinishedStudy(t.handle.db, { workspaceId });
      const r = await t.call("POST", `/api/studies/${f.studyId}/reports`, { cookie: c.engineer, body: { supplierId: larkfield } });
      expect(r.status, JSON.stringify(r.body)).toBe(201);
      const current = await change("PATCH", `/api/reports/${r.body.id}`, c.engineer, { note: "theirs" }, r.body.version);
      return { path: `/api/reports/${r.body.id}`, cookie: c.engineer, stale: r.body.version, current, state: () => row.report(r.body.id) };
    },
    done: { status: 204, state: () => undefined },
  },
];

describe("a deletion, archive or restore names the version it was made on", () => {
  for (const k of CASES) {
    const method = k.route.split(" ")[0];
    it(`${k.route}: stale → 409 with the current version and nothing changed; none → 428; current → done`, async () => {
      const x = await k.make();
      expect(x.current).toBeGreaterThan(x.stale);
      const before = await x.state();
      expect(before).toBeDefined();

      const stale = await t.call(method, x.path, { cookie: x.cookie, headers: tag(x.stale) });
      expect(stale.status, JSON.stringify(stale.body)).toBe(409);
      expect(stale.body.error).toMatchObject({ code: "conflict", version: x.current });
      expect(stale.body.error.message).toMatch(/changed by someone else/);
      expect(await x.state()).toEqual(before);

      const none = await t.call(method, x.path, { cookie: x.cookie });
      expect(none.status, JSON.stringify(none.body)).toBe(428);
      expect(none.body.error.code).toBe("precondition_required");
      expect(await x.state()).toEqual(before);

      // the version in the body is read alike (a client that cannot set headers)
      const ok =
        method === "DELETE"
          ? await t.call(method, x.path, { cookie: x.cookie, headers: tag(x.current) })
          : await t.call(method, x.path, { cookie: x.cookie, body: { version: x.current } });
      expect(ok.status, JSON.stringify(ok.body)).toBe(k.done.status);
      expect(await x.state()).toEqual(k.done.state(before));
    });
  }

  it("an unknown record stays a 404 without a version (nothing is learnt from a 428)", async () => {
    for (const path of [
      "/api/projects/00000000-0000-4000-8000-000000000000",
      "/api/suppliers/00000000-0000-4000-8000-000000000000",
      "/api/datasets/00000000-0000-4000-8000-000000000000",
      "/api/reports/00000000-0000-4000-8000-000000000000",
    ]) {
      const res = await t.call("DELETE", path, { cookie: c.admin });
      expect(res.status, path).toBe(404);
    }
  });

  it("of two deletions made on one version, exactly one is taken", async () => {
    const id = await newProject();
    const [a, b] = await Promise.all([
      t.call("DELETE", `/api/projects/${id}`, { cookie: c.engineer, headers: tag(1) }),
      t.call("DELETE", `/api/projects/${id}`, { cookie: c.admin, headers: tag(1) }),
    ]);
    expect([a.status, b.status].sort()).toEqual([204, 404]);
    expect(await row.project(id)).toBeUndefined();
  });

  it("a study has no version: of two people running a stopped one again at once, its state lets one through", async () => {
    const f = await insertFinishedStudy(t.handle.db, { workspaceId, studyStatus: "running" });
    await t.handle.db.update(studies).set({ status: "failed" }).where(eq(studies.id, f.studyId));
    const answers = await Promise.all(
      [c.engineer, c.admin].map((cookie) => t.call("POST", `/api/studies/${f.studyId}/rerun`, { cookie, body: {} })),
    );
    expect(answers.map((a) => a.status).sort()).toEqual([202, 409]);
    expect(answers.find((a) => a.status === 409)!.body.error.code).toBe("invalid_state");
  });
});
