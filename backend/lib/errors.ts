import type { ErrorRequestHandler, RequestHandler } from "express";
import { ZodError, type core } from "zod";
import type { FieldError } from "@shared/schemas/common";
import { formatPath } from "@shared/schemas/field-issues";
import { ResponseMismatchError } from "./respond";

export type { FieldError };

/** An error that carries its HTTP status and a stable code for the client. */
export class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields?: FieldError[],
    /** a record's current version, on a 409 `conflict` (backend/lib/versions.ts) */
    readonly version?: number,
  ) {
    super(message);
  }
}

export const badRequest = (message: string, fields?: FieldError[], code = "invalid_input") => new HttpError(400, code, message, fields);
export const unauthorized = () => new HttpError(401, "unauthenticated", "Sign in to continue.");
export const forbidden = (message = "Your role does not allow this.") => new HttpError(403, "forbidden", message);
export const notFound = (what = "The resource") => new HttpError(404, "not_found", `${what} was not found.`);
export const conflict = (message: string, code = "conflict") => new HttpError(409, code, message);

/** A write refused by a unique index (PostgreSQL's 23505), however deep the drivers wrapped it. */
export function isUniqueViolation(e: unknown): boolean {
  for (let err = e as { code?: unknown; cause?: unknown } | undefined, depth = 0; err && depth < 5; depth++) {
    if (err.code === "23505") return true;
    err = err.cause as typeof err;
  }
  return false;
}

/** `invariant`-style helper: throws a 404 unless the value exists. */
export function found<T>(value: T | undefined | null, what: string): T {
  if (value === undefined || value === null) throw notFound(what);
  return value;
}

export function zodFields(issues: ReadonlyArray<core.$ZodIssue>, prefix = ""): FieldError[] {
  return issues.map((i) => {
    const p = formatPath(i.path);
    return { path: prefix && p ? `${prefix}.${p}` : prefix || p, message: i.message };
  });
}

export const notFoundApi: RequestHandler = (req) => {
  throw new HttpError(404, "not_found", `No API route ${req.method} ${req.path}.`);
};

export const DISK_FULL_MESSAGE =
  "The server's disk is nearly full, so nothing was stored. Ask your administrator to free space; no restart is needed afterwards.";

/** A write that failed because the disk (or the user's disk quota) is full. */
export function isDiskFull(err: unknown): boolean {
  const code = (err as { code?: unknown } | null)?.code;
  return code === "ENOSPC" || code === "EDQUOT";
}

/** The one error middleware: every failure leaves as the same JSON shape, never with internals. */
export function errorHandler(log: (err: unknown) => void): ErrorRequestHandler {
  return (err, _req, res, _next) => {
    if (err instanceof HttpError) {
      res.status(err.status).json({
        error: {
          code: err.code,
          message: err.message,
          ...(err.fields ? { fields: err.fields } : {}),
          ...(err.version !== undefined ? { version: err.version } : {}),
        },
      });
      return;
    }
    if (err instanceof ZodError) {
      res.status(400).json({
        error: { code: "invalid_input", message: "Some fields are not valid.", fields: zodFields(err.issues) },
      });
      return;
    }
    // Only where answers are checked (development, tests): our own answer broke its contract.
    if (err instanceof ResponseMismatchError) {
      log(err);
      res.status(500).json({ error: { code: "response_mismatch", message: err.message, fields: err.fields } });
      return;
    }
    const e = err as { type?: string; status?: number; statusCode?: number };
    if (e?.type === "entity.parse.failed") {
      res.status(400).json({ error: { code: "malformed_json", message: "The request body is not valid JSON." } });
      return;
    }
    if (e?.type === "entity.too.large") {
      res.status(413).json({ error: { code: "too_large", message: "The request body is too large." } });
      return;
    }
    // A write that met a full disk is an answer, not a 500: the server keeps serving, and the
    // same write succeeds once space is freed.
    if (isDiskFull(err)) {
      log(err);
      res.status(507).json({ error: { code: "insufficient_storage", message: DISK_FULL_MESSAGE } });
      return;
    }
    const status = e?.status ?? e?.statusCode;
    if (typeof status === "number" && status >= 400 && status < 500) {
      res.status(status).json({ error: { code: "bad_request", message: "The request could not be read." } });
      return;
    }
    log(err);
    res.status(500).json({ error: { code: "internal", message: "Something went wrong on the server." } });
  };
}
