/**
 * Element facts shared by the schemas and the model. Kept apart from the zod schemas so
 * the engine's worker code does not load zod.
 */

export const SENSOR_KINDS = ["gyro", "accel", "mag"] as const;

export function isSensorKind(kind: string): kind is (typeof SENSOR_KINDS)[number] {
  return kind === "gyro" || kind === "accel" || kind === "mag";
}

/** Support points of an element in its own frame: the listed ones or the four corners. */
export function supportPoints(e: {
  size: { x: number; y: number };
  bondLine?: { supports?: "corners" | { x: number; y: number }[] };
}): { x: number; y: number }[] {
  const s = e.bondLine?.supports;
  if (Array.isArray(s)) return s;
  const hx = e.size.x / 2,
    hy = e.size.y / 2;
  return [
    { x: -hx, y: -hy },
    { x: hx, y: -hy },
    { x: hx, y: hy },
    { x: -hx, y: hy },
  ];
}
