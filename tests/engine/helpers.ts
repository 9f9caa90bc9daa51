import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { validateStackFile, type StackFile } from "@shared/schemas/stack-file";
import { validateStudy, type StudyFile } from "@shared/schemas/study-file";

export function fixture(name: string): unknown {
  return JSON.parse(readFileSync(fileURLToPath(new URL(`../fixtures/${name}`, import.meta.url)), "utf8"));
}

export function stackOf(json: unknown): StackFile {
  const v = validateStackFile(json);
  if (!v.ok) throw new Error(JSON.stringify(v.issues));
  return v.stack;
}

export function studyOf(json: unknown, stack: StackFile): StudyFile {
  const v = validateStudy(json, stack);
  if (!v.ok) throw new Error(JSON.stringify(v.issues));
  return v.study;
}

export const referenceStack = () => stackOf(fixture("stack-reference.json"));

/** Board with an accelerometer and a magnetometer side by side, every tolerance given by the caller. */
export function compassStack(accel: Record<string, unknown> = {}, mag: Record<string, unknown> = {}): StackFile {
  return stackOf({
    format: "orthostack.stack/1",
    elements: [
      { id: "board", kind: "board", parent: null, size: { x: 20, y: 20, z: 1 } },
      { id: "acc", kind: "accel", parent: "board", position: { x: -3, y: 0 }, size: { x: 2, y: 2, z: 0.5 }, ...accel },
      { id: "mag", kind: "mag", parent: "board", position: { x: 3, y: 0 }, size: { x: 2, y: 2, z: 0.5 }, ...mag },
    ],
  });
}

export function study(extra: Record<string, unknown> = {}): Record<string, unknown> {
  return { format: "orthostack.study/1", trials: 1000, seed: 1, inclinationDeg: 60, ...extra };
}

/** Exact standard error of the sample p-quantile from a density value: sqrt(p(1−p)/n)/f. */
export const quantileSE = (p: number, n: number, density: number) => Math.sqrt((p * (1 - p)) / n) / density;
