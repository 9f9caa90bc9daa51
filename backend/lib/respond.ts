/**
 * Answers checked against their contract: every JSON answer of the API goes out through `send`
 * (or `sendVersioned`, backend/lib/versions.ts) with its response schema from `shared/schemas`,
 * the same schema the client parses it with. In development and tests (`checkResponses` in
 * AppDeps) the answer, as the client will read it after JSON, is parsed with the schema first:
 * a mismatch is a 500 `response_mismatch` naming each field, logged, so a route that drifts
 * from its contract fails its own test rather than a screen. In production nothing is parsed.
 * docs/decisions/035-checked-responses.md
 */
import type { Response } from "express";
import type * as z from "zod";
import type { FieldError } from "@shared/schemas/common";
import { formatPath } from "@shared/schemas/field-issues";

/** Set on `app.locals` by createApp from AppDeps.checkResponses. */
export const CHECK_RESPONSES = "checkResponses";

/** The server's own answer does not match its schema: a bug in the server (or the schema), never the client's fault. */
export class ResponseMismatchError extends Error {
  constructor(
    readonly route: string,
    readonly fields: FieldError[],
  ) {
    super(`The answer to ${route} does not match its schema: ${fields.map((f) => `${f.path || "(answer)"}: ${f.message}`).join("; ")}`);
    this.name = "ResponseMismatchError";
  }
}

/**
 * Throws a ResponseMismatchError unless `body`, as JSON carries it (dates as text, undefined
 * fields left out), parses with `schema`.
 */
export function checkResponse(schema: z.ZodType, body: unknown, route: string): void {
  const wire: unknown = body === undefined ? undefined : JSON.parse(JSON.stringify(body));
  const result = schema.safeParse(wire);
  if (result.success) return;
  throw new ResponseMismatchError(
    route,
    result.error.issues.map((i) => ({ path: formatPath(i.path), message: i.message })),
  );
}

/** Whether this app checks its answers (development and tests). */
export function checksResponses(res: Response): boolean {
  return res.app?.locals?.[CHECK_RESPONSES] === true;
}

/**
 * Sends `body` as JSON with `status`, after checking it against `schema` where the app checks
 * its answers. The body is typed as the schema's input, so most drift is a compile error already.
 */
export function send<S extends z.ZodType>(res: Response, schema: S, body: z.input<S>, status = 200): void {
  if (checksResponses(res)) checkResponse(schema, body, `${res.req.method} ${res.req.originalUrl.split("?")[0]}`);
  res.status(status).json(body);
}
