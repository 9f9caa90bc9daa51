/**
 * Problems of the document, placed where the engineer can act on them: the validator's
 * paths (`elements[2].size.x`, the server's `stack.elements[2].size.x`,
 * `requirements[0].metric`) are split into the element (or requirement) they belong to
 * and the field inside it, which is the key the form and the tables look up.
 */
import { metricIds } from "@shared/engine/model";
import { formatPath, fromZodError, validateStackFile, type FieldError, type StackValidation } from "@shared/schemas/stack-file";
import { RequirementSchema } from "@shared/schemas/study-file";
import type { EditorDoc } from "./stack-ops";

export interface LocalIssue {
  /** path inside the element or requirement, "" for the thing itself */
  field: string;
  message: string;
}

export interface IssueIndex {
  elements: Map<number, LocalIssue[]>;
  requirements: Map<number, LocalIssue[]>;
  /** problems of the file as a whole (format, the list of elements, the board) */
  general: FieldError[];
  count: number;
}

const ELEMENT_PATH = /^elements\[(\d+)\](?:\.?(.*))?$/;
const REQUIREMENT_PATH = /^requirements\[(\d+)\](?:\.?(.*))?$/;

export function indexIssues(issues: FieldError[]): IssueIndex {
  const out: IssueIndex = { elements: new Map(), requirements: new Map(), general: [], count: issues.length };
  for (const issue of issues) {
    const el = ELEMENT_PATH.exec(issue.path);
    const rq = el ? null : REQUIREMENT_PATH.exec(issue.path);
    const m = el ?? rq;
    if (!m) {
      out.general.push(issue);
      continue;
    }
    const map = el ? out.elements : out.requirements;
    const index = Number(m[1]);
    const list = map.get(index) ?? [];
    list.push({ field: m[2] ?? "", message: issue.message });
    map.set(index, list);
  }
  return out;
}

/** The first message for exactly this field. */
export function fieldError(list: LocalIssue[] | undefined, field: string): string | undefined {
  return list?.find((i) => i.field === field)?.message;
}

/** Every message for this field and the fields inside it (`bondLine` holds `bondLine.heightTol.tol`). */
export function errorsUnder(list: LocalIssue[] | undefined, prefix: string): LocalIssue[] {
  if (!list) return [];
  if (prefix === "") return list;
  return list.filter((i) => i.field === prefix || i.field.startsWith(`${prefix}.`) || i.field.startsWith(`${prefix}[`));
}

/** The server names stack fields under `stack.`; the editor's paths start at the file. */
export function fromServerFields(fields: ReadonlyArray<FieldError>): FieldError[] {
  return fields.map((f) => ({
    path: f.path === "stack" ? "" : f.path.startsWith("stack.") ? f.path.slice("stack.".length) : f.path,
    message: f.message,
  }));
}

/**
 * Every problem of the document, with the same validators the server uses: the stack
 * file's schema and cross-element checks, each requirement's schema, and whether the
 * stack offers the metric a requirement names.
 */
export function validateDoc(doc: EditorDoc, v: StackValidation = validateStackFile(doc.stack)): FieldError[] {
  const issues: FieldError[] = v.ok ? [] : [...v.issues];
  let ids: Set<string> | null = null;
  try {
    ids = new Set(metricIds(doc.stack, {}));
  } catch {
    ids = null;
  }
  doc.requirements.forEach((r, i) => {
    const parsed = RequirementSchema.safeParse(r);
    if (!parsed.success) {
      for (const issue of fromZodError(parsed.error)) {
        issues.push({
          path: issue.path ? `${formatPath(["requirements", i])}.${issue.path}` : formatPath(["requirements", i]),
          message: issue.message,
        });
      }
    }
    if (ids && typeof r.metric === "string" && r.metric !== "" && !ids.has(r.metric)) {
      issues.push({ path: `requirements[${i}].metric`, message: `the stack has no metric “${r.metric}”` });
    }
  });
  return issues;
}
