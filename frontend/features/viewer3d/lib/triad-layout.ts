/** Where the sensing-axis arrows go: one triad per sensor die, sized to the die. */
import type { StackFile } from "@shared/schemas/stack-file";
import { isSensorKind } from "@shared/schemas/stack-file";

export interface TriadLayout {
  /** element index of each sensor */
  sensors: number[];
  /** arrow length per sensor (mm) */
  length: number[];
}

export function triadLayout(stack: StackFile): TriadLayout {
  const sensors: number[] = [],
    length: number[] = [];
  stack.elements.forEach((e, i) => {
    if (!isSensorKind(e.kind)) return;
    sensors.push(i);
    length.push(0.5 * Math.max(e.size.x, e.size.y) + 0.4);
  });
  return { sensors, length };
}

export const SHAFT_R = 0.014;
export const HEAD_R = 0.045;
export const HEAD_L = 0.13;
