/**
 * Problems found in a file or body, as a JSON path and a sentence ("elements[2].size.x": "...").
 * Shared by the stack and study files and the API's field errors.
 */
import type * as z from "zod";
import type { FieldError } from "./common";

export type { FieldError };

/** ["elements", 2, "size", "x"] -> "elements[2].size.x"; the file itself is "". */
export function formatPath(path: ReadonlyArray<PropertyKey>): string {
  let out = "";
  for (const k of path) {
    if (typeof k === "number") out += `[${k}]`;
    else out += out === "" ? String(k) : `.${String(k)}`;
  }
  return out;
}

export function describe(v: unknown): string {
  if (v === null) return "null";
  if (Array.isArray(v)) return "a list";
  if (typeof v === "string") return `the text ${JSON.stringify(v.length > 40 ? v.slice(0, 40) + "…" : v)}`;
  if (typeof v === "object") return "an object";
  return `${typeof v} ${String(v)}`;
}

const EXPECTED: Record<string, string> = {
  number: "a number",
  string: "a text",
  object: "an object",
  array: "a list",
  boolean: "true or false",
  null: "null",
};

/**
 * A size limit was passed (too many elements, points, values, characters): such a file is
 * refused on its size alone, before any check across its parts runs on it. Looks into the
 * branches of a union ("corners" or a list of points).
 */
export function isSizeIssue(issue: z.core.$ZodIssue): boolean {
  if (issue.code === "too_big") return true;
  if (issue.code === "invalid_union") return issue.errors.some((branch) => branch.some(isSizeIssue));
  return false;
}

/** One zod issue as field issues (unknown keys are reported one by one). */
export function fromZodIssue(issue: z.core.$ZodIssue): FieldError[] {
  const path = formatPath(issue.path);
  // a union whose one fitting branch is too long says so, rather than "must be A or B"
  if (issue.code === "invalid_union") {
    const sized = issue.errors.filter((branch) => branch.some(isSizeIssue));
    if (sized.length === 1)
      return sized[0].filter(isSizeIssue).flatMap((i) => fromZodIssue({ ...i, path: [...issue.path, ...i.path] } as z.core.$ZodIssue));
  }
  if (issue.code === "unrecognized_keys") {
    return issue.keys.map((k) => ({
      path: formatPath([...issue.path, k]),
      message: `unknown field "${k}": check the spelling (free-form data belongs in "meta")`,
    }));
  }
  // zod's built-in texts start with "Invalid input"; our own messages are kept as written
  if (issue.message.startsWith("Invalid input") || issue.message.startsWith("Invalid option")) {
    const input = (issue as { input?: unknown }).input;
    if (input === undefined) return [{ path, message: "this field is required" }];
    if (issue.code === "invalid_type") {
      return [{ path, message: `expected ${EXPECTED[issue.expected] ?? issue.expected}, got ${describe(input)}` }];
    }
    return [{ path, message: `${describe(input)} is not accepted here` }];
  }
  return [{ path, message: issue.message }];
}

export function fromZodError(err: z.ZodError): FieldError[] {
  return err.issues.flatMap(fromZodIssue);
}

/** The error body of the API: `{"error":{"code","message","fields":[{path,message}]}}`. */
export function toErrorBody(code: string, message: string, issues: FieldError[]) {
  return { error: { code, message, fields: issues } };
}

export function dedupe(issues: FieldError[]): FieldError[] {
  const seen = new Set<string>();
  return issues.filter((i) => {
    const k = `${i.path}\u0000${i.message}`;
    if (seen.has(k)) return false;
    seen.add(k);
    return true;
  });
}
