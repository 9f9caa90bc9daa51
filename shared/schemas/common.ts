import * as z from "zod";

/** Roles of a workspace member (DESIGN.md, "People and roles"). */
export const ROLES = ["admin", "engineer", "reviewer", "supplier"] as const;
export const RoleSchema = z.enum(ROLES);
export type Role = z.infer<typeof RoleSchema>;

export const IdSchema = z.string().uuid({ message: "must be a valid id" });
export const IdParamsSchema = z.object({ id: IdSchema });

/**
 * One problem with one field, as a JSON path and a sentence ("elements[2].size.x": "..."): the
 * API's field errors, the stack and study file checks and the client's forms all use this type.
 */
export const FieldErrorSchema = z.object({ path: z.string(), message: z.string() });
export type FieldError = z.infer<typeof FieldErrorSchema>;

/** The one error shape every API answer uses. */
export const ApiErrorSchema = z.object({
  error: z.object({
    code: z.string(),
    message: z.string(),
    fields: z.array(FieldErrorSchema).optional(),
    /** on a 409 `conflict`: the record's current version (someone else changed it meanwhile) */
    version: z.number().int().optional(),
  }),
});
export type ApiError = z.infer<typeof ApiErrorSchema>;

// ---- text, dates and numbers from outside ----------------------------------------

/**
 * Every text field of a body, file or query: a NUL character (U+0000) is refused by name,
 * since PostgreSQL stores no NUL in text or jsonb (the database error was a 500 before).
 */
export const text = (params?: Parameters<typeof z.string>[0]) =>
  z.string(params).refine((s) => !s.includes("\u0000"), { message: "must not contain NUL characters (\\u0000)" });

/** A calendar date written YYYY-MM-DD that exists: 2026-02-30 is refused, not moved to March. */
export const isoDate = (what = "date") =>
  text({ message: `${what} is required (YYYY-MM-DD)` })
    .regex(/^\d{4}-\d{2}-\d{2}$/, { message: `${what} must be written YYYY-MM-DD` })
    .refine(
      (d) => {
        const t = Date.parse(`${d}T00:00:00Z`);
        return !Number.isNaN(t) && new Date(t).toISOString().slice(0, 10) === d;
      },
      { message: `${what} is not a real calendar date` },
    );

/**
 * A number in a query string: "?altitudeKm=" is refused like any other text that is not a
 * number (coercion would read the empty text as 0).
 */
export const queryNumber = (what: string, limits: (n: z.ZodNumber) => z.ZodNumber = (n) => n) =>
  z.preprocess(
    (v) => (typeof v === "string" ? (v.trim() === "" ? Number.NaN : Number(v)) : v),
    limits(z.number({ message: `${what} must be a number` })),
  );

// ---- versions of shared records (docs/decisions/034-record-versions.md) -----------------------

/** The edit counter of a record people share: 1 when made, one more with every change. */
export const VersionSchema = z
  .number({ message: "version must be a whole number" })
  .int({ message: "version must be a whole number" })
  .min(1, { message: "version starts at 1" })
  .max(2_147_483_647, { message: "version is too large" });

/** The version a change is based on, sent in the body instead of an If-Match header. */
export const VersionBodySchema = z.object({ version: VersionSchema.optional() });

/**
 * An If-Match header naming one version: the ETag `"3"` as sent (a weak `W/"3"` and a bare 3 too).
 * A list of tags or `*` names no single version and is refused.
 */
export const IfMatchSchema = z
  .string()
  .trim()
  .regex(/^(?:W\/)?"?[1-9][0-9]{0,9}"?$/, { message: 'If-Match must be one version as sent in the ETag, e.g. "3"' })
  .transform((s) => Number(s.replace(/^W\//, "").replace(/"/g, "")))
  .pipe(VersionSchema);

/** The ETag of a record at a version; the client sends it back as If-Match. */
export const versionTag = (version: number) => `"${version}"`;
