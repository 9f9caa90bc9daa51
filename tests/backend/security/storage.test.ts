/**
 * Issue 10, item 5: faults answered, never hung. A full disk (injected: the guard's free-space
 * reading, or a write failing with ENOSPC) is a 507 with a clear message, nothing is stored, the
 * server keeps answering, and once space is back the same upload succeeds without a restart. A
 * workspace has a storage quota; a supplier company has an upload rate.
 */
import { mkdtempSync, readdirSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq, sql } from "drizzle-orm";
import { datasets, reports, suppliers } from "@backend/db/schema";
import { errorHandler } from "@backend/lib/errors";
import { storageGuard } from "@backend/lib/storage";
import { startTestApp, type TestApp } from "../harness";
import { emptyReportContent } from "../report-fixtures";

const REFERENCE = JSON.parse(readFileSync(new URL("../../fixtures/stack-reference.json", import.meta.url), "utf8"));

let t: TestApp;
let eng: string;
let sup: string;
let projectId: string;
let revisionId: string;
const uploadDir = mkdtempSync(join(tmpdir(), "orthostack-uploads-"));
// What the injected disk reports: plenty, nothing, or a failing file system.
let disk: "room" | "full" | "enospc" = "room";
let quotaBytes = 50 * 1024 * 1024;

beforeAll(async () => {
  const guard = storageGuard({ paths: ["/injected"], reserveBytes: 1024 * 1024, workspaceQuotaBytes: 0, uploadDir }, async () => {
    if (disk === "enospc") throw Object.assign(new Error("no space left on device"), { code: "ENOSPC" });
    return disk === "full" ? 512 * 1024 : 1e12;
  });
  t = await startTestApp({
    storage: {
      ...guard,
      get workspaceQuotaBytes() {
        return quotaBytes;
      },
    },
    supplierUploadsPerHour: 3,
  });
  eng = await t.signIn("engineer@example.com");
  sup = await t.signIn("supplier@example.com");
  projectId = (await t.call("POST", "/api/projects", { cookie: eng, body: { name: "disk" } })).body.id;
  revisionId = (await t.call("POST", `/api/projects/${projectId}/revisions`, { cookie: eng, body: { stack: REFERENCE } })).body.id;
});
afterAll(async () => {
  await t?.close();
  rmSync(uploadDir, { recursive: true, force: true });
});

async function upload(path: string, cookie: string, content = "v [um]\n1\n2\n3\n") {
  const form = new FormData();
  form.append("file", new Blob([new Uint8Array(Buffer.from(content))]), "heights.csv");
  const res = await fetch(t.url + path, { method: "POST", headers: { origin: t.deps.baseURL, cookie }, body: form });
  const text = await res.text();
  return { status: res.status, body: text ? JSON.parse(text) : null };
}
const count = async () => (await t.handle.db.select({ n: sql<number>`count(*)::int` }).from(datasets))[0].n;

describe("a full disk is an answer, not a hang", () => {
  it("an upload on a full disk is a 507 naming the problem; nothing stored; the server keeps answering; after space is freed it succeeds", async () => {
    const before = await count();
    disk = "full";
    const refused = await upload(`/api/projects/${projectId}/datasets`, eng);
    expect(refused.status).toBe(507);
    expect(refused.body.error.code).toBe("insufficient_storage");
    expect(refused.body.error.message).toMatch(/disk is nearly full.*nothing was stored/i);
    expect(await count()).toBe(before);
    const started = Date.now();
    expect((await t.call("GET", "/api/health")).status).toBe(200);
    expect((await t.call("GET", `/api/projects/${projectId}/datasets`, { cookie: eng })).status).toBe(200);
    expect(Date.now() - started).toBeLessThan(10_000);

    disk = "enospc";
    const failing = await upload(`/api/projects/${projectId}/datasets`, eng);
    expect(failing.status).toBe(507);
    expect(await count()).toBe(before);

    disk = "room";
    const ok = await upload(`/api/projects/${projectId}/datasets`, eng);
    expect(ok.status, JSON.stringify(ok.body)).toBe(201);
    expect(await count()).toBe(before + 1);
  });

  it("the upload is streamed through a temporary file, removed afterwards", async () => {
    const ok = await upload(`/api/projects/${projectId}/datasets`, eng, "h [um]\n4\n5\n");
    expect(ok.status).toBe(201);
    expect(readdirSync(uploadDir)).toEqual([]);
  });

  it("a write that meets ENOSPC anywhere leaves as 507, not 500", () => {
    const logged: unknown[] = [];
    let status = 0;
    let body: any;
    const res = { status: (s: number) => ((status = s), res), json: (b: unknown) => ((body = b), res) } as any;
    errorHandler((e) => logged.push(e))(Object.assign(new Error("write failed"), { code: "ENOSPC" }), {} as any, res, () => {});
    expect(status).toBe(507);
    expect(body.error.code).toBe("insufficient_storage");
    expect(JSON.stringify(body)).not.toMatch(/write failed/);
  });
});

describe("quota and upload rate", () => {
  it("a workspace past its quota is refused with what it uses, nothing stored", async () => {
    const before = await count();
    quotaBytes = 10;
    const refused = await upload(`/api/projects/${projectId}/datasets`, eng);
    quotaBytes = 50 * 1024 * 1024;
    expect(refused.status).toBe(507);
    expect(refused.body.error.code).toBe("quota_exceeded");
    expect(refused.body.error.message).toMatch(/quota of 0\.0 MB/);
    expect(await count()).toBe(before);
  });

  it("a supplier company may send so many measurement files per hour", async () => {
    const [s] = await t.handle.db.select().from(suppliers).where(eq(suppliers.name, "Larkfield Assembly"));
    const [{ next }] = await t.handle.db.select({ next: sql<number>`coalesce(max(${reports.number}), 0)::int + 1` }).from(reports);
    const [r] = await t.handle.db
      .insert(reports)
      .values({
        workspaceId: s.workspaceId,
        projectId,
        supplierId: s.id,
        revisionId,
        number: next,
        revision: 1,
        status: "released",
        capability: { cpk: 1.33, overrides: {} },
        content: emptyReportContent({ projectId, revisionId, supplier: s }),
        releasedAt: new Date(),
      })
      .returning();
    const statuses: number[] = [];
    for (let i = 0; i < 4; i++) statuses.push((await upload(`/api/reports/${r.id}/datasets`, sup)).status);
    expect(statuses).toEqual([201, 201, 201, 429]);
    // staff uploads are not held to the supplier's rate
    expect((await upload(`/api/projects/${projectId}/datasets`, eng)).status).toBe(201);
  });
});
