import type { Browser } from "playwright-core";
import { afterAll, beforeAll } from "vitest";
import { launchBrowser, openSession, type Session } from "./browser";
import { startServer, type RunningServer } from "./server";

export type E2E = {
  readonly baseURL: string;
  /** A new browser context (its own cookies), closed after the file. */
  session: () => Promise<Session>;
};

/** One real server and one chromium per test file. */
export function setupE2E(): E2E {
  let server: RunningServer | undefined;
  let browser: Browser | undefined;
  const sessions: Session[] = [];

  beforeAll(async () => {
    [server, browser] = await Promise.all([startServer(), launchBrowser()]);
  });
  afterAll(async () => {
    await Promise.allSettled(sessions.map((s) => s.context.close()));
    await browser?.close();
    await server?.stop();
    // A request the server failed on (a 500) fails the file, even when the page hid it.
    const failures = (server?.output() ?? "").split("\n").filter((line) => line.includes("[orthostack] unhandled error"));
    if (failures.length) throw new Error(`the server logged ${failures.length} unhandled error(s):\n${server?.output()}`);
  });

  return {
    get baseURL() {
      if (!server) throw new Error("server not started");
      return server.baseURL;
    },
    async session() {
      if (!server || !browser) throw new Error("setupE2E: beforeAll has not run");
      const s = await openSession(browser, server.baseURL);
      sessions.push(s);
      return s;
    },
  };
}

/**
 * Uncaught errors, and console errors other than the browser's own note about an HTTP
 * error status (a 401 on the sign-in page is expected, so is a 400 a test provokes).
 */
export function unexpectedProblems(problems: string[]): string[] {
  return problems.filter((p) => !/Failed to load resource: the server responded with a status of 4\d\d/.test(p));
}
