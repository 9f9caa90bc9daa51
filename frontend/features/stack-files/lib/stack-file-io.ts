/**
 * Stack files in and out of the editor: reading an imported file (JSON, then the stack
 * file's own validator) and the name and text of an exported one.
 */
import { validateStackFile, type FieldError, type StackFile } from "@shared/schemas/stack-file";

/** A problem of an imported file, with the id of the element it is in when the file names one. */
export type ImportIssue = FieldError & { element?: string };
export type ImportResult = { ok: true; stack: StackFile } | { ok: false; message: string; issues: ImportIssue[] };

export function withElementIds(json: unknown, issues: FieldError[]): ImportIssue[] {
  const els =
    json && typeof json === "object" && Array.isArray((json as { elements?: unknown }).elements)
      ? (json as { elements: unknown[] }).elements
      : [];
  return issues.map((i) => {
    const m = /^(?:stack\.)?elements\[(\d+)\]/.exec(i.path);
    const el = m ? els[Number(m[1])] : undefined;
    const id = el && typeof el === "object" ? (el as { id?: unknown }).id : undefined;
    return typeof id === "string" && id ? { ...i, element: id } : i;
  });
}

export const MAX_IMPORT_BYTES = 20 * 1024 * 1024;

export function readStackFileText(text: string): ImportResult {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (error) {
    return { ok: false, message: `The file is not JSON: ${error instanceof Error ? error.message : String(error)}`, issues: [] };
  }
  const v = validateStackFile(json);
  if (!v.ok)
    return {
      ok: false,
      message: `The file has ${v.issues.length === 1 ? "a problem" : `${v.issues.length} problems`}; nothing was imported.`,
      issues: withElementIds(json, v.issues),
    };
  return { ok: true, stack: v.stack };
}

/** Pretty JSON with a final newline, the same as the server's download. */
export function stackFileText(stack: StackFile): string {
  return JSON.stringify(stack, null, 2) + "\n";
}

export function stackFileName(name: string | undefined, revisionNumber: number): string {
  const slug =
    (name ?? "")
      .replace(/[^\w.-]+/g, "-")
      .replace(/^-+|-+$/g, "")
      .slice(0, 80) || "stack";
  return `${slug}-rev${revisionNumber}.stack.json`;
}
