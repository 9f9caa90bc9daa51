/**
 * Issue 10, item 7: HSTS and the CSP's `upgrade-insecure-requests` only when APP_URL is https.
 * On a plain-http deployment they made the browser ask for every asset over https (none loaded).
 */
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { AddressInfo } from "node:net";
import type { Server } from "node:http";
import { createApp } from "@backend/app";
import { startTestApp, type TestApp } from "../harness";

let t: TestApp;
beforeAll(async () => {
  t = await startTestApp({ seed: false });
});
afterAll(async () => t?.close());

async function headersFor(appUrl: string, strictCsp: boolean) {
  const app = createApp({ ...t.deps, baseURL: appUrl }, { strictCsp });
  const server: Server = await new Promise((resolve) => {
    const s = app.listen(0, "127.0.0.1", () => resolve(s));
  });
  try {
    const res = await fetch(`http://127.0.0.1:${(server.address() as AddressInfo).port}/api/health`);
    return res.headers;
  } finally {
    await new Promise((r) => server.close(r));
  }
}

describe("security headers follow APP_URL's scheme", () => {
  it.each(["http://stack.example.com", "http://192.168.1.20:3000"])(
    "plain http (%s): no HSTS, no upgrade-insecure-requests",
    async (url) => {
      const h = await headersFor(url, true);
      expect(h.get("strict-transport-security")).toBeNull();
      const csp = h.get("content-security-policy") ?? "";
      expect(csp).toContain("default-src 'self'");
      expect(csp).not.toContain("upgrade-insecure-requests");
    },
  );

  it("https: HSTS for a year and upgrade-insecure-requests", async () => {
    const h = await headersFor("https://stack.example.com", true);
    expect(h.get("strict-transport-security")).toMatch(/max-age=31536000/);
    expect(h.get("content-security-policy")).toContain("upgrade-insecure-requests");
  });

  it("without the strict CSP (development) there is no CSP, and HSTS still follows the scheme", async () => {
    expect((await headersFor("http://localhost:3000", false)).get("content-security-policy")).toBeNull();
    expect((await headersFor("https://stack.example.com", false)).get("strict-transport-security")).not.toBeNull();
  });
});
