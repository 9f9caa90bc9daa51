/**
 * Versions of the records people share (revisions, projects, reports, data sets, suppliers):
 * a change (a deletion too) names the version it was made on (If-Match, or `version` in the
 * body), the write is a conditional UPDATE on that version that adds one to it (or a conditional
 * DELETE) in the same transaction, and a stale version is a 409 `conflict` carrying the current
 * one, so no edit is silently overwritten or deleted unseen.
 * docs/decisions/034-record-versions.md
 */
import type { Request, Response } from "express";
import type * as z from "zod";
import { and, eq, sql, type SQL } from "drizzle-orm";
import type { PgColumn, PgTable, PgUpdateSetSource } from "drizzle-orm/pg-core";
import { IfMatchSchema, VersionBodySchema, versionTag } from "@shared/schemas/common";
import type { Database } from "../db/client";
import { badRequest, HttpError, notFound, zodFields } from "./errors";
import { send } from "./respond";

type Executor = Pick<Database, "update" | "select" | "delete">;
type VersionedTable = PgTable & { id: PgColumn; version: PgColumn };

export const versionRequired = () =>
  new HttpError(
    428,
    "precondition_required",
    "Say which version you changed: send the ETag you last read as If-Match (or version in the body), so a change made meanwhile is not overwritten.",
  );

export const staleVersion = (what: string, current: number) =>
  new HttpError(
    409,
    "conflict",
    `${what} was changed by someone else since you loaded it (it is now at version ${current}). Load it again and reapply your change.`,
    undefined,
    current,
  );

/** The version the request says it was made on, if it says one; a malformed one is a 400. */
export function sentVersion(req: Request): number | undefined {
  const header = req.get("if-match");
  const body = VersionBodySchema.safeParse(req.body && typeof req.body === "object" ? req.body : {});
  if (!body.success) throw badRequest("The version is not valid.", zodFields(body.error.issues));
  let fromHeader: number | undefined;
  if (header !== undefined) {
    const parsed = IfMatchSchema.safeParse(header);
    if (!parsed.success) throw badRequest("The If-Match header is not valid.", zodFields(parsed.error.issues, "If-Match"));
    fromHeader = parsed.data;
  }
  if (fromHeader !== undefined && body.data.version !== undefined && fromHeader !== body.data.version) {
    throw badRequest("If-Match and the body's version disagree.", [{ path: "version", message: `If-Match says ${fromHeader}` }]);
  }
  return fromHeader ?? body.data.version;
}

/** Refuses early (before any costly work) a change based on a version that is no longer current. */
export function assertVersion(what: string, current: number, sent: number | undefined) {
  if (sent !== undefined && current !== sent) throw staleVersion(what, current);
}

/**
 * The version a change is based on, checked against the record's current one once the record is
 * found (so an unknown or hidden record stays a 404): none is a 428, a stale one a 409.
 */
export function requireVersion(what: string, current: number, sent: number | undefined): number {
  if (sent === undefined) throw versionRequired();
  assertVersion(what, current, sent);
  return sent;
}

/**
 * The conditional write: sets `set` and adds one to the version where the id matches, the version
 * is still `expected` (unless undefined: a change that does not require one) and `where` holds.
 * Nothing updated → a stale version is a 409 `conflict` with the current one; otherwise
 * `otherwise()` (the caller's own refusal, e.g. the record left its draft state) or a 404.
 * Returns the new version. Call it inside the transaction that writes the activity record.
 */
export async function writeVersioned<T extends VersionedTable>(
  tx: Executor,
  table: T,
  id: string,
  expected: number | undefined,
  what: string,
  set: PgUpdateSetSource<T> = {},
  options: { where?: SQL; otherwise?: () => HttpError } = {},
): Promise<number> {
  const changed = (await tx
    .update(table)
    .set({ ...set, version: sql`${table.version} + 1` } as PgUpdateSetSource<T>)
    .where(and(eq(table.id, id), expected !== undefined ? eq(table.version, expected) : undefined, options.where))
    .returning({ version: table.version })) as Array<{ version: number }>;
  if (changed.length) return changed[0].version;
  throw await missedWrite(tx, table, id, expected, what, options.otherwise);
}

/** Why a conditional write or delete touched nothing: the record is gone (404), its version moved on (409), or the caller's own reason. */
async function missedWrite(
  tx: Executor,
  table: VersionedTable,
  id: string,
  expected: number | undefined,
  what: string,
  otherwise?: () => HttpError,
): Promise<HttpError> {
  const [row] = (await tx
    .select({ version: table.version })
    .from(table as PgTable)
    .where(eq(table.id, id))) as Array<{ version: number }>;
  if (!row) return notFound(what);
  if (expected !== undefined && row.version !== expected) return staleVersion(what, row.version);
  return otherwise?.() ?? notFound(what);
}

/**
 * The conditional delete: removes the row where the id matches, the version is still `expected`
 * and `where` holds. Nothing removed → a stale version is a 409 `conflict` with the current one
 * (the record stays), otherwise `otherwise()` or a 404. Call it inside the transaction that
 * writes the activity record (and removes what hangs on the row).
 */
export async function deleteVersioned<T extends VersionedTable>(
  tx: Executor,
  table: T,
  id: string,
  expected: number,
  what: string,
  options: { where?: SQL; otherwise?: () => HttpError } = {},
): Promise<void> {
  const gone = (await tx
    .delete(table)
    .where(and(eq(table.id, id), eq(table.version, expected), options.where))
    .returning({ id: table.id })) as Array<{ id: string }>;
  if (gone.length) return;
  throw await missedWrite(tx, table, id, expected, what, options.otherwise);
}

/**
 * Answers with a versioned record and its ETag, checked against its schema like every answer
 * (backend/lib/respond.ts). Not stored by the browser: the ETag names the record's edit counter,
 * not every byte of the answer (comments, last study), so a cached copy revalidated against it
 * could be stale.
 */
export function sendVersioned<S extends z.ZodType<{ version: number }>>(
  res: Response,
  schema: S,
  record: z.input<S> & { version: number },
  status = 200,
) {
  res.setHeader("ETag", versionTag(record.version));
  res.setHeader("Cache-Control", "private, no-store");
  send(res, schema, record, status);
}
