import { validateStackFile, type StackFile } from "@shared/schemas/stack-file";
import type { Requirement } from "@shared/schemas/revisions";
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
  const ids = new Set(metricIdsOf(stack));
  const fields = requirements.flatMap((r, i) =>
    ids.has(r.metric) ? [] : [{ path: `requirements[${i}].metric`, message: `the stack has no metric “${r.metric}”` }],
  );
  if (fields.length) throw badRequest("A requirement names a metric the stack does not have.", fields, "invalid_requirements");
}

// TEMPORARY until the engine exports its metric list: MODEL.md section 7.
function metricIdsOf(stack: StackFile): string[] {
  const ids: string[] = [];
  const sensors = stack.elements.filter((e) => e.kind === "gyro" || e.kind === "accel" || e.kind === "mag");
  for (const s of sensors) {
    for (const i of ["x", "y", "z"]) {
      for (const j of ["x", "y", "z"]) if (i !== j) ids.push(`${s.id}.crossAxisPct.${i}${j}`);
      ids.push(`${s.id}.crossAxisTotalPct.${i}`, `${s.id}.axisMisalignDeg.${i}`);
    }
  }
  for (const e of stack.elements) if (e.kind !== "board") ids.push(`${e.id}.tiltDeg`);
  for (let a = 0; a < sensors.length; a++) for (let b = a + 1; b < sensors.length; b++) ids.push(`${sensors[a].id}~${sensors[b].id}.relRotDeg`);
  if (sensors.some((s) => s.kind === "accel") && sensors.some((s) => s.kind === "mag")) ids.push("heading.maxAbsDeg", "heading.rmsDeg");
  return ids;
}
