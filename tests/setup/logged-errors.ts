// Errors a test app's server logged (tests/backend/harness.ts passes its log here), so that the
// guard of tests/setup/fail-on-errors.ts can fail the test during which one was logged.

type Logged = { message: string; error: unknown };

let logged: Logged[] = [];
let allowed: RegExp[] = [];

/** The harness's log: an entry with an error is a server error; a plain line is not. */
export function recordServerLog(message: string, error?: unknown): void {
  if (error !== undefined) logged.push({ message, error });
}

/**
 * A test that provokes a server error on purpose (a study that throws, a full disk) says which:
 * errors whose message or error text matches are not counted, for the current test only.
 */
export function allowServerErrors(pattern: RegExp): void {
  allowed.push(pattern);
}

/** The unexpected errors logged since the last call, as lines; the allowances are cleared. */
export function takeUnexpectedServerErrors(): string[] {
  const lines = logged
    .map(({ message, error }) => `${message}: ${error instanceof Error ? (error.stack ?? error.message) : String(error)}`)
    .filter((line) => !allowed.some((p) => p.test(line)));
  logged = [];
  allowed = [];
  return lines;
}

let allowedConsole: RegExp[] = [];

/** A test that makes a library print an error on purpose says which, for the current test only. */
export function allowConsoleErrors(pattern: RegExp): void {
  allowedConsole.push(pattern);
}

/** The console.error lines that no allowance covers; the allowances are cleared. */
export function unexpectedConsoleErrors(lines: string[]): string[] {
  const left = lines.filter((line) => !allowedConsole.some((p) => p.test(line)));
  allowedConsole = [];
  return left;
}
