import type { FieldValues, Path, UseFormReturn } from "react-hook-form";
import { placeLabel, readableMessage } from "@shared/field-labels";
import { isApiError } from "./api-client";

/** Messages from the shared schemas may start in lower case ("must be a valid e-mail address"). */
export function sentence(message: string): string {
  // the file's keys, element paths and unit words become the words a person reads
  const m = readableMessage(message);
  return m.charAt(0).toUpperCase() + m.slice(1);
}

/** One of a 400's field messages as a person reads it: the place in words, never the API's path. */
export function fieldProblemText(f: { path: string; message: string }): string {
  const message = readableMessage(f.message);
  return f.path ? `${sentence(placeLabel(f.path))}: ${message}` : sentence(message);
}

/** The longest part of `path` ("cc.2" or "cc[2]" -> "cc") that names a value the form holds, if any. */
function heldPath(values: unknown, path: string): string | undefined {
  let at: unknown = values;
  const held: string[] = [];
  for (const key of path.replace(/\[(\d+)\]/g, ".$1").split(".")) {
    if (at === null || typeof at !== "object" || !(key in at)) break;
    at = (at as Record<string, unknown>)[key];
    held.push(key);
  }
  return held.length > 0 ? held.join(".") : undefined;
}

/**
 * Puts the field messages of a failed request on the form (react-hook-form's `setError`, first message per field;
 * "cc.2" on "cc" when the form holds the list as one text); a message for no field or a field the form does not
 * have, and any other failure, goes to `root.server`.
 */
export function setServerErrors<T extends FieldValues>(form: Pick<UseFormReturn<T>, "setError" | "getValues">, error: unknown): void {
  if (!isApiError(error)) {
    form.setError("root.server", { type: "server", message: "Something went wrong. Try again." });
    return;
  }
  const values = form.getValues();
  const placed = new Set<string>();
  let formLevel: string | undefined = error.fields.length === 0 ? error.message : undefined;
  for (const f of error.fields) {
    const path = f.path ? heldPath(values, f.path) : undefined;
    if (path !== undefined) {
      if (!placed.has(path)) form.setError(path as Path<T>, { type: "server", message: f.message });
      placed.add(path);
    } else {
      formLevel ??= f.message;
    }
  }
  if (formLevel !== undefined) form.setError("root.server", { type: "server", message: formLevel });
}

/** The first message in a field's errors, a list's included (react-hook-form nests "cc.2" as `cc[2]`). */
export function firstErrorMessage(errors: unknown): string | undefined {
  if (errors === null || typeof errors !== "object") return undefined;
  if ("message" in errors && typeof errors.message === "string") return errors.message;
  for (const [key, value] of Object.entries(errors)) {
    if (key === "ref") continue; // the input element
    const message = firstErrorMessage(value);
    if (message !== undefined) return message;
  }
  return undefined;
}
