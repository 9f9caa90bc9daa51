/**
 * Issue 10, item 2, in a real browser: a page served from another port of the same host (same
 * site, so the browser sends the SameSite=Lax session cookie along with a top-level form post)
 * posts forms to approve a revision, release a report and create a project. All are refused and
 * nothing changes.
 */
import { createServer, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import { afterAll, describe, expect, it } from "vitest";
import type { Page } from "playwright-core";
import { signInAs } from "./support/browser";
import { setupE2E } from "./support/setup";

const e2e = setupE2E();
let attacker: Server | undefined;
afterAll(async () => {
  await new Promise((r) => (attacker ? attacker.close(r) : r(null)));
});

/** A call from the app's own page, with its session: the way the client itself calls. */
async function own(page: Page, method: string, path: string, body?: unknown, headers: Record<string, string> = {}) {
  return page.evaluate(
    async ([m, p, b, h]) => {
      const res = await fetch(p as string, {
        method: m as string,
        headers: { ...(b === undefined ? {} : { "content-type": "application/json" }), ...(h as Record<string, string>) },
        body: b === undefined ? undefined : JSON.stringify(b),
      });
      return { status: res.status, etag: res.headers.get("etag"), body: await res.json().catch(() => null) };
    },
    [method, path, body, headers] as const,
  );
}

async function waitForDemoStudy(page: Page, projectId: string) {
  const end = Date.now() + 150_000;
  for (;;) {
    const { body } = await own(page, "GET", `/api/projects/${projectId}/studies`);
    const done = (body.studies as Array<{ id: string; status: string }>).find((s) => s.status === "finished");
    if (done) return done.id;
    if (Date.now() > end) throw new Error("the demo study did not finish");
    await page.waitForTimeout(1000);
  }
}

/** The attacker's page: three forms that submit themselves one after another into iframes. */
function attackerPage(app: string, revisionId: string, reportId: string) {
  const form = (name: string, action: string, enctype: string, fields: string) =>
    `<form id="${name}" method="POST" action="${app}${action}" enctype="${enctype}" target="${name}-frame">${fields}</form><iframe name="${name}-frame"></iframe>`;
  return `<!doctype html><html><body>
${form("approve", `/api/revisions/${revisionId}/approve`, "application/x-www-form-urlencoded", '<input name="comment" value="looks fine">')}
${form("release", `/api/reports/${reportId}/release`, "text/plain", `<input name='{"comment":"ok","x":"' value='"}'>`)}
${form("create", "/api/projects", "text/plain", `<input name='{"name":"Planted by another port","x":"' value='"}'>`)}
<script>
  for (const id of ["approve", "release", "create"]) document.getElementById(id).submit();
  window.sent = true;
</script></body></html>`;
}

describe("writes from another port of the same host", () => {
  it("forms posted from another port cannot approve, release or create", async () => {
    const { page } = await e2e.session();
    await signInAs(page, "admin@example.com");
    const { body: plist } = await own(page, "GET", "/api/projects");
    const project = plist.projects[0] as { id: string };

    // a revision in review
    const { body: rlist } = await own(page, "GET", `/api/projects/${project.id}/revisions`);
    const draft = (rlist.revisions as Array<{ id: string; status: string; version?: number }>).find((r) => r.status === "draft")!;
    const current = await own(page, "GET", `/api/revisions/${draft.id}`);
    const submitted = await own(
      page,
      "POST",
      `/api/revisions/${draft.id}/submit`,
      // the demo draft misses a requirement: submitted knowingly
      { version: current.body.version, confirmFailing: true },
      current.etag ? { "if-match": current.etag } : {},
    );
    expect(submitted.status).toBe(200);

    // a draft report from the demo study
    const studyId = await waitForDemoStudy(page, project.id);
    const { body: slist } = await own(page, "GET", "/api/suppliers");
    const larkfield = (slist.suppliers as Array<{ id: string; name: string }>).find((s) => s.name === "Larkfield Assembly")!;
    const built = await own(page, "POST", `/api/studies/${studyId}/reports`, { supplierId: larkfield.id });
    expect(built.status).toBe(201);
    const reportId = built.body.id as string;

    // the attacker's page on another port of the same host name
    const appUrl = new URL(e2e.baseURL);
    attacker = createServer((_req, res) => {
      res.setHeader("content-type", "text/html");
      res.end(attackerPage(e2e.baseURL, draft.id, reportId));
    });
    await new Promise<void>((r) => attacker!.listen(0, "127.0.0.1", () => r()));
    const evil = `http://${appUrl.hostname}:${(attacker.address() as AddressInfo).port}/`;

    const answers: Array<{ url: string; status: number }> = [];
    page.on("response", (r) => {
      // the writes only: the app's own polls (notifications) may answer meanwhile
      if (r.url().startsWith(`${e2e.baseURL}/api/`) && r.request().method() !== "GET") answers.push({ url: r.url(), status: r.status() });
    });
    await page.goto(evil);
    await page.waitForFunction(() => (window as unknown as { sent?: boolean }).sent === true);
    await expect.poll(() => answers.length, { timeout: 15_000 }).toBe(3);
    for (const a of answers) expect(a.status, a.url).toBe(403);

    // nothing changed
    await page.goto("/projects");
    expect((await own(page, "GET", `/api/revisions/${draft.id}`)).body.status).toBe("in_review");
    expect((await own(page, "GET", `/api/reports/${reportId}`)).body.status).toBe("draft");
    const after = (await own(page, "GET", "/api/projects")).body.projects as Array<{ name: string }>;
    expect(after.map((p) => p.name)).not.toContain("Planted by another port");
    // and the session is still the person's own
    expect((await own(page, "GET", "/api/me")).status).toBe(200);
  });
});
