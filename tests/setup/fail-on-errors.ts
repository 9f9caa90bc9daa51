// Setup file of every project but the browser one: a test fails when it wrote to console.error
// (a React warning, a caught error printed instead of handled) or when a test app's server logged
// an error during it (tests/setup/logged-errors.ts). The browser files check the page and the
// server's output themselves (tests/e2e/support).
import { afterEach, beforeEach, expect, vi } from "vitest";
import { takeUnexpectedServerErrors, unexpectedConsoleErrors } from "./logged-errors";

let consoleError: ReturnType<typeof vi.spyOn> | undefined;

beforeEach(() => {
  consoleError = vi.spyOn(console, "error");
});

afterEach(() => {
  const calls = unexpectedConsoleErrors((consoleError?.mock.calls ?? []).map((args: unknown[]) => args.map(String).join(" ")));
  consoleError?.mockRestore();
  const serverErrors = takeUnexpectedServerErrors();
  expect(calls, "console.error was called during the test").toEqual([]);
  expect(serverErrors, "the server logged an error during the test").toEqual([]);
});
