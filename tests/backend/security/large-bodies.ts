/**
 * The largest request bodies the size limits of shared/schemas admit, and some just beyond: used
 * by the body-limit test and by `npm run bench:bodies` (backend/cli/bench-bodies.ts).
 */
import { metricIds } from "@shared/engine/compile";
import { MAX_DATA_VALUES, MAX_ELEMENTS, MAX_META_CHARS, MAX_SENSORS, MAX_SUPPORTS, type StackFile } from "@shared/schemas/stack-file";

const SENSORS = ["gyro", "accel", "mag"] as const;
const tol = (t: number) => ({ dist: "normal" as const, tol: t });

/** `n` support points on a circle inside a 10 × 10 mm footprint; on one line when `line`. */
const supports = (n: number, line = false) =>
  Array.from({ length: n }, (_, k) => {
    const a = (2 * Math.PI * k) / n;
    return line ? { x: -4 + (8 * k) / (n - 1), y: 0 } : { x: 4 * Math.cos(a), y: 4 * Math.sin(a) };
  });

/**
 * MAX_ELEMENTS elements in one chain (each sits on the one before: the longest parent chain),
 * MAX_SENSORS of them sensors, each with MAX_SUPPORTS support points, full-length names,
 * full meta on the file.
 */
export function largestStack(opts: { supportsOnALine?: boolean; cycle?: boolean; elements?: number; supports?: number } = {}): StackFile {
  const n = opts.elements ?? MAX_ELEMENTS;
  const elements: StackFile["elements"] = [{ id: "board", kind: "board", parent: null, size: { x: 10, y: 10, z: 1 }, bowUm: tol(40) }];
  for (let i = 1; i < n; i++) {
    const sensor = i % Math.floor(n / MAX_SENSORS) === 0 && elements.filter((e) => SENSORS.includes(e.kind as never)).length < MAX_SENSORS;
    elements.push({
      id: `e${String(i).padStart(3, "0")}`,
      kind: sensor ? SENSORS[i % 3] : "spacer",
      parent: opts.cycle && i === 1 ? `e${String(n - 1).padStart(3, "0")}` : elements[i - 1].id,
      name: `${"n".repeat(196)}${String(i).padStart(4, "0")}`,
      size: { x: 10, y: 10, z: 0.01 },
      bondLine: { thicknessUm: 10, heightTol: tol(2), supports: supports(opts.supports ?? MAX_SUPPORTS, opts.supportsOnALine) },
      placementTol: { xUm: tol(10), yUm: tol(10), yawDeg: tol(0.1) },
      tiltTol: { x: tol(0.01), y: tol(0.01) },
      ...(sensor ? { axisTol: tol(0.2) } : {}),
    });
  }
  return {
    format: "orthostack.stack/1",
    name: "n".repeat(200),
    notes: "n".repeat(5000),
    meta: { note: "m".repeat(MAX_META_CHARS - 20) },
    elements,
  };
}

/** Up to 200 requirements, on metrics the stack has. */
export function largestRequirements(stack: StackFile) {
  return metricIds(stack, { heading: false })
    .slice(0, 200)
    .map((metric) => ({ metric, max: 1, yield: 0.99, name: "r".repeat(200) }));
}

/** The reference stack with two measured tolerances of MAX_DATA_VALUES values each (about 1.3 MiB). */
export function measuredStack(reference: StackFile, values = MAX_DATA_VALUES): StackFile {
  const s = structuredClone(reference);
  const data = (k: number) => ({ dist: "data" as const, values: Array.from({ length: values }, (_, i) => ((i * 7 + k) % 1000) / 100) });
  s.elements[0].bowUm = data(1);
  s.elements[1].bowUm = data(2);
  return s;
}

export type BodyCase = { label: string; body: unknown; status: 200 | 400; field?: string };

/** PATCH /api/revisions/:id bodies: the largest the limits admit, checks at their worst, and just beyond. */
export function revisionBodies(reference: StackFile): BodyCase[] {
  const big = largestStack();
  return [
    {
      label: `two measured tolerances of ${MAX_DATA_VALUES.toLocaleString("en-US")} values`,
      body: { stack: measuredStack(reference) },
      status: 200,
    },
    {
      label: `a measured tolerance of ${(MAX_DATA_VALUES + 1).toLocaleString("en-US")} values`,
      body: { stack: measuredStack(reference, MAX_DATA_VALUES + 1) },
      status: 400,
      field: "stack.elements[0].bowUm.values",
    },
    {
      label: `largest valid stack (${MAX_ELEMENTS}-deep chain, ${MAX_SUPPORTS} supports each, 200 requirements)`,
      body: { stack: big, requirements: largestRequirements(big) },
      status: 200,
    },
    {
      label: `${MAX_ELEMENTS} elements in one cycle`,
      body: { stack: largestStack({ cycle: true }) },
      status: 400,
      field: "stack.elements[1].parent",
    },
    {
      label: `${MAX_ELEMENTS} × ${MAX_SUPPORTS} supports on a line`,
      body: { stack: largestStack({ supportsOnALine: true }) },
      status: 400,
      field: "stack.elements[1].bondLine.supports",
    },
    {
      label: `${MAX_SUPPORTS + 1} support points`,
      body: { stack: largestStack({ supports: MAX_SUPPORTS + 1, elements: 20 }) },
      status: 400,
      field: "stack.elements[1].bondLine.supports",
    },
    {
      label: "2,400 support points",
      body: { stack: largestStack({ supports: 2400, elements: 2 }) },
      status: 400,
      field: "stack.elements[1].bondLine.supports",
    },
    {
      label: `${MAX_ELEMENTS + 1} elements`,
      body: { stack: largestStack({ elements: MAX_ELEMENTS + 1, supports: 3 }) },
      status: 400,
      field: "stack.elements",
    },
    { label: "2,500 nested parents", body: { stack: largestStack({ elements: 2500, supports: 3 }) }, status: 400, field: "stack.elements" },
    {
      label: "201 requirements",
      body: { requirements: [...largestRequirements(big), ...largestRequirements(big)].slice(0, 201) },
      status: 400,
      field: "requirements",
    },
  ];
}
