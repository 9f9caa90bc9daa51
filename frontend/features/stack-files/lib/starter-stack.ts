import type { StackFile } from "@shared/schemas/stack-file";

/** The stack a new, empty project starts from: a board only. */
export function starterStack(name: string): StackFile {
  return {
    format: "orthostack.stack/1",
    name,
    elements: [{ id: "board", kind: "board", parent: null, size: { x: 40, y: 30, z: 1.0 } }],
  };
}
