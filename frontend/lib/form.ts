import type { z } from "zod";
import { readableMessage } from "@shared/field-labels";
import { isApiError } from "./api-client";

export type FieldErrors = Record<string, string>;

/** Messages from the shared schemas may start in lower case ("must be a valid e-mail address"). */
export function sentence(message: string): string {
  // the file's keys, element paths and unit words become the words a person reads
  const m = readableMessage(message);
  return m.charAt(0).toUpperCase() + m.slice(1);
}

/** First message per top-level field of a failed zod parse. */
export function zodFieldErrors(error: z.ZodError): FieldErrors {
  const out: FieldErrors = {};
  for (const issue of error.issues) {
    const key = issue.path.length > 0 ? issue.path.map(String).join(".") : "_form";
    if (!(key in out)) out[key] = issue.message;
  }
  return out;
}

/** Field messages from a 400 answer; anything without a field goes to `_form`. */
export function serverFieldErrors(error: unknown): FieldErrors {
  if (!isApiError(error)) return { _form: "Something went wrong. Try again." };
  const out: FieldErrors = {};
  for (const f of error.fields) {
    const key = f.path || "_form";
    if (!(key in out)) out[key] = f.message;
  }
  if (error.fields.length === 0) out._form = error.message;
  return out;
}

/** Parses raw form values with a shared schema: the values, or errors per field. */
export function parseForm<S extends z.ZodType>(
  schema: S,
  values: unknown,
): { ok: true; data: z.infer<S> } | { ok: false; errors: FieldErrors } {
  const result = schema.safeParse(values);
  return result.success ? { ok: true, data: result.data } : { ok: false, errors: zodFieldErrors(result.error) };
}
