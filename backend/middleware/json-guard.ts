/**
 * Bodies and query strings that would reach code in a shape nobody wrote a schema for: nesting
 * so deep that a recursive walk (zod, the database's jsonb) overflows the stack, a `__proto__`
 * key (JSON.parse makes it an own property that zod then drops without a word, and a plain
 * object assignment turns into a prototype change), a NUL character (PostgreSQL stores none).
 * Each is a 400 naming where it was found, before any route reads the request.
 */
import type { RequestHandler } from "express";
import { formatPath } from "@shared/schemas/stack-file";
import { badRequest, type FieldError } from "../lib/errors";

/** Deepest nesting of objects and lists a body may have; a stack file needs 8. */
export const MAX_JSON_DEPTH = 32;

/**
 * The deepest nesting in JSON text, counted on the raw bytes before parsing (so a body of
 * 100,000 brackets never becomes 100,000 nested objects); stops counting past `limit`.
 */
export function jsonDepthOver(raw: Buffer, limit: number): boolean {
  let depth = 0;
  let inString = false;
  for (let i = 0; i < raw.length; i++) {
    const b = raw[i];
    if (inString) {
      if (b === 0x5c)
        i++; // backslash: skip the escaped byte
      else if (b === 0x22) inString = false;
    } else if (b === 0x22) inString = true;
    else if (b === 0x7b || b === 0x5b) {
      if (++depth > limit) return true;
    } else if (b === 0x7d || b === 0x5d) depth--;
  }
  return false;
}

/** For express.json's `verify`: refuses a body nested deeper than MAX_JSON_DEPTH. */
export function verifyJsonDepth(_req: unknown, _res: unknown, raw: Buffer) {
  if (jsonDepthOver(raw, MAX_JSON_DEPTH)) {
    throw badRequest(`The request body is nested more than ${MAX_JSON_DEPTH} levels deep.`, [
      { path: "", message: `nesting is limited to ${MAX_JSON_DEPTH} levels of objects and lists` },
    ]);
  }
}

const MAX_LISTED = 20;

/** Every `__proto__` key and every text holding NUL, with its path (the first 20). */
export function unsafeParts(value: unknown): FieldError[] {
  const found: FieldError[] = [];
  // one path, pushed and popped as the walk goes: a body of 2 × 10^5 measured values would
  // otherwise copy a path for every number, though a number can hold neither
  const path: (string | number)[] = [];
  const walk = (v: unknown) => {
    if (found.length >= MAX_LISTED) return;
    if (typeof v === "string") {
      if (v.includes("\u0000")) found.push({ path: formatPath(path), message: "must not contain NUL characters (\\u0000)" });
    } else if (Array.isArray(v)) {
      for (let i = 0; i < v.length; i++) {
        const x: unknown = v[i];
        if (typeof x !== "string" && (typeof x !== "object" || x === null)) continue;
        path.push(i);
        walk(x);
        path.pop();
      }
    } else if (v && typeof v === "object") {
      for (const key of Object.keys(v)) {
        if (key === "__proto__") found.push({ path: formatPath([...path, key]), message: "__proto__ is not accepted as a field name" });
        else if (key.includes("\u0000"))
          found.push({ path: formatPath(path), message: "a field name must not contain NUL characters (\\u0000)" });
        else {
          path.push(key);
          walk((v as Record<string, unknown>)[key]);
          path.pop();
        }
      }
    }
  };
  walk(value);
  return found;
}

/** Refuses a parsed body or query string holding a `__proto__` key or a NUL character. */
export const refuseUnsafeInput: RequestHandler = (req, _res, next) => {
  const inBody = unsafeParts(req.body);
  if (inBody.length) throw badRequest("The request body is not valid.", inBody);
  const inQuery = unsafeParts(req.query);
  if (inQuery.length) throw badRequest("The query string is not valid.", inQuery);
  next();
};
