import { validateStackFile, type StackFile } from "@shared/schemas/stack-file";
import type { Requirement } from "@shared/schemas/revisions";
import { metricIds } from "@shared/engine/model";
import { badRequest } from "../lib/errors";

/** Validates a stack file for the API: a 400 with one field per problem, paths under `stack`. */
export function checkStack(json: unknown): StackFile {
  const v = validateStackFile(json);
  if (!v.ok) {
    throw badRequest(
      `The stack file has ${v.issues.length === 1 ? "a problem" : `${v.issues.length} problems`}; nothing was stored.`,
      v.issues.map((i) => ({ path: i.path ? `stack.${i.path}` : "stack", message: i.message })),
      "invalid_stack",
    );
  }
  return v.stack;
}

/** Every requirement must name a metric the stack has. */
export function checkRequirements(stack: StackFile, requirements: Requirement[]) {
  const ids = new Set(metricIds(stack, {}));
  const fields = requirements.flatMap((r, i) =>
    ids.has(r.metric) ? [] : [{ path: `requirements[${i}].metric`, message: `the stack has no metric “${r.metric}”` }],
  );
  if (fields.length) throw badRequest("A requirement names a metric the stack does not have.", fields, "invalid_requirements");
}
