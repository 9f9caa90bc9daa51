/**
 * The stack file (MODEL.md section 9, `"format": "orthostack.stack/1"`).
 *
 * Defaults are not filled in by the schema: a parsed file round-trips unchanged, and the
 * engine applies the defaults of MODEL.md when it compiles the stack.
 * Every problem is reported with a JSON path (`elements[2].size.x`) and a sentence a
 * packaging engineer understands, so the API can pass them on as field errors.
 */
import * as z from "zod";
import { text } from "./common";
import { isSensorKind, SENSOR_KINDS, supportPoints } from "../engine/elements";

export { isSensorKind, SENSOR_KINDS, supportPoints };

export { dedupe, formatPath, fromZodError, fromZodIssue, isSizeIssue, toErrorBody, type FieldError } from "./field-issues";
import { dedupe, describe, formatPath, fromZodError, isSizeIssue, type FieldError } from "./field-issues";

// ---------------------------------------------------------------- building blocks

export const STAGES = ["die", "package", "board", "product"] as const;
export const ELEMENT_STAGES = ["package", "board", "product"] as const;
export const DISTRIBUTIONS = ["normal", "uniform", "triangular", "data"] as const;
export const ELEMENT_KINDS = ["board", "substrate", "asic", "spacer", "gyro", "accel", "mag"] as const;

/** Longest list accepted for a measured data set, and for any list of support points. */
export const MAX_DATA_VALUES = 100_000;
export const MAX_SUPPORTS = 64;
export const MAX_ELEMENTS = 200;
/** Sensor dies per stack: every pair has a relative-rotation metric, so metrics grow as n². */
export const MAX_SENSORS = 24;

const finite = (what: string) =>
  z.number({
    error: (iss) => (iss.input === undefined ? `${what} is required` : `${what} must be a number, got ${describe(iss.input)}`),
  });

const positive = (what: string) => finite(what).gt(0, { error: `${what} must be greater than 0` });

const stageEnum = <const T extends readonly [string, ...string[]]>(values: T) =>
  z.enum(values, {
    error: (iss) => `unknown stage ${JSON.stringify(iss.input)}: use ${values.map((v) => `"${v}"`).join(", ")}`,
  });

export const StageSchema = stageEnum(STAGES);
export const ElementStageSchema = stageEnum(ELEMENT_STAGES);

/** Free-form data stays small: it is stored and sent back with every read of the file. */
export const MAX_META_CHARS = 20_000;
export const MetaSchema = z.record(text(), z.unknown()).superRefine((m, ctx) => {
  if (JSON.stringify(m).length > MAX_META_CHARS)
    ctx.addIssue({
      code: "too_big",
      origin: "string",
      maximum: MAX_META_CHARS,
      inclusive: true,
      message: `meta is limited to ${MAX_META_CHARS.toLocaleString("en-US")} characters of JSON`,
    });
});

/**
 * A tolerance (MODEL.md section 8). ±tol is the half-width; for "normal", tol = sigmas·σ.
 * "data" replaces the tolerance by a measured data set that is resampled.
 */
export const ToleranceSchema = z
  .strictObject({
    dist: z.enum(DISTRIBUTIONS, {
      error: (iss) =>
        iss.input === undefined
          ? `a tolerance needs "dist": "normal", "uniform", "triangular" or "data"`
          : `unknown distribution ${JSON.stringify(iss.input)}: use "normal", "uniform", "triangular" or "data"`,
    }),
    tol: finite("the half-width tol").min(0, { error: "the half-width tol cannot be negative" }).optional(),
    sigmas: positive("sigmas").optional(),
    mean: finite("the mean").optional(),
    values: z
      .array(finite("a measured value"), { error: "values must be a list of numbers" })
      .min(2, { error: "a measured data set needs at least two values" })
      .max(MAX_DATA_VALUES, { error: `a measured data set may hold at most ${MAX_DATA_VALUES} values` })
      .optional(),
    /**
     * Measured units drawn whole: one row per unit, one value per draw of the source (a bond
     * line's support heights in support order, a tilt's x and y, the six axis angles g1..g6).
     */
    rows: z
      .array(
        z
          .array(finite("a measured value"), { error: "each row must be a list of numbers" })
          .min(2, { error: "a row holds at least two values" })
          .max(MAX_SUPPORTS, { error: `a row holds at most ${MAX_SUPPORTS} values` }),
        {
          error: "rows must be a list of rows",
        },
      )
      .min(2, { error: "measured rows need at least two units" })
      .max(MAX_DATA_VALUES, { error: `measured rows may hold at most ${MAX_DATA_VALUES} units` })
      .optional(),
    stage: StageSchema.optional(),
    owner: text().max(200, { error: "owner is limited to 200 characters" }).optional(),
  })
  .superRefine((t, ctx) => {
    if (t.dist === "data") {
      if (!t.values && !t.rows) ctx.addIssue({ code: "custom", path: ["values"], message: `a "data" tolerance needs its measured values` });
      if (t.values && t.rows) ctx.addIssue({ code: "custom", path: ["rows"], message: `give either values or rows, not both` });
      if (t.rows && t.rows.some((r) => r.length !== t.rows![0].length)) {
        ctx.addIssue({ code: "custom", path: ["rows"], message: "every measured row needs the same number of values" });
      }
      if (t.tol !== undefined || t.sigmas !== undefined)
        ctx.addIssue({
          code: "custom",
          path: ["tol"],
          message: `a "data" tolerance takes its spread from the values: leave out tol and sigmas`,
        });
    } else {
      if (t.tol === undefined) ctx.addIssue({ code: "custom", path: ["tol"], message: `a tolerance needs its half-width "tol"` });
      if (t.values !== undefined) ctx.addIssue({ code: "custom", path: ["values"], message: `measured values need "dist": "data"` });
      if (t.rows !== undefined) ctx.addIssue({ code: "custom", path: ["rows"], message: `measured rows need "dist": "data"` });
      if (t.sigmas !== undefined && t.dist !== "normal")
        ctx.addIssue({
          code: "custom",
          path: ["sigmas"],
          message: `sigmas applies to "normal" tolerances only: a ${t.dist} tolerance spans mean ± tol`,
        });
    }
  });

const XYSchema = z.strictObject({ x: finite("x (mm)"), y: finite("y (mm)") });

export const SizeSchema = z.strictObject({
  x: positive("the length size.x (mm)"),
  y: positive("the width size.y (mm)"),
  z: positive("the thickness size.z (mm)"),
});

export const BondLineSchema = z.strictObject({
  thicknessUm: positive("the bond-line thickness (um)").optional(),
  heightTol: ToleranceSchema.optional(),
  supports: z
    .union(
      [
        z.literal("corners"),
        z.array(XYSchema, { error: `supports must be "corners" or a list of points {"x", "y"}` }).max(MAX_SUPPORTS, {
          error: `at most ${MAX_SUPPORTS} support points`,
        }),
      ],
      { error: `supports must be "corners" or a list of points {"x", "y"}` },
    )
    .optional(),
});

export const ElementSchema = z.strictObject({
  id: z
    .string({ error: "every element needs an id" })
    .min(1, { error: "the id cannot be empty" })
    .max(64, { error: "an id is limited to 64 characters" })
    .regex(/^[A-Za-z0-9_-]+$/, {
      error: "an id may hold letters, digits, - and _ only (it becomes part of metric names such as mag.tiltDeg)",
    }),
  kind: z.enum(ELEMENT_KINDS, {
    error: (iss) => `unknown element kind ${JSON.stringify(iss.input)}: use ${ELEMENT_KINDS.map((k) => `"${k}"`).join(", ")}`,
  }),
  parent: z.union([text().max(64, { error: "parent is an element id, at most 64 characters" }), z.null()], {
    error: "parent must be the id of another element, or null for the board",
  }),
  name: text().max(200, { error: "a name is limited to 200 characters" }).optional(),
  notes: text().max(5000, { error: "notes are limited to 5,000 characters" }).optional(),
  meta: MetaSchema.optional(),
  stage: ElementStageSchema.optional(),
  position: XYSchema.optional(),
  yawDeg: finite("yawDeg").optional(),
  size: SizeSchema,
  bondLine: BondLineSchema.optional(),
  /** `xy`: both components measured together (rows of two, x then y), in place of x and y */
  tiltTol: z.strictObject({ x: ToleranceSchema.optional(), y: ToleranceSchema.optional(), xy: ToleranceSchema.optional() }).optional(),
  placementTol: z
    .strictObject({ xUm: ToleranceSchema.optional(), yUm: ToleranceSchema.optional(), yawDeg: ToleranceSchema.optional() })
    .optional(),
  bowUm: ToleranceSchema.optional(),
  axisTol: z
    .union([ToleranceSchema, z.array(ToleranceSchema).length(6, { error: "axisTol as a list needs six tolerances, g1 to g6" })], {
      error: "axisTol must be one tolerance or a list of six (g1..g6)",
    })
    .optional(),
});

/** The file's shape alone, without the checks across elements (extendable with `.extend`). */
export const StackFileObjectSchema = z.strictObject({
  format: z.literal("orthostack.stack/1", { error: `format must be "orthostack.stack/1"` }),
  name: text().max(200, { error: "a name is limited to 200 characters" }).optional(),
  notes: text().max(5000, { error: "notes are limited to 5,000 characters" }).optional(),
  meta: MetaSchema.optional(),
  elements: z
    .array(ElementSchema, { error: "elements must be a list" })
    .min(1, { error: "a stack needs at least the board" })
    .max(MAX_ELEMENTS, { error: `a stack may hold at most ${MAX_ELEMENTS} elements` }),
});

export type Tolerance = z.infer<typeof ToleranceSchema>;
export type StackElement = z.infer<typeof ElementSchema>;
export type StackFile = z.infer<typeof StackFileObjectSchema>;
export type ElementKind = (typeof ELEMENT_KINDS)[number];

const fmt = (v: number) => String(Math.round(v * 1e6) / 1e6);

type Loose = Record<string, unknown>;
const isObj = (v: unknown): v is Loose => typeof v === "object" && v !== null && !Array.isArray(v);
const isNum = (v: unknown): v is number => typeof v === "number" && Number.isFinite(v);

/**
 * Checks across elements: the tree, footprints, supports. Written against the raw JSON
 * with guards, so it also runs when some fields are malformed and every problem of a
 * file is reported at once.
 */
export function checkStack(file: unknown, add: (issue: { path: (string | number)[]; message: string }) => void): void {
  if (!isObj(file) || !Array.isArray(file.elements)) return;
  const els = file.elements.map((e) => (isObj(e) ? e : ({} as Loose)));
  const idOf = (e: Loose) => (typeof e.id === "string" ? e.id : undefined);
  const firstIndex = new Map<string, number>();
  els.forEach((e, i) => {
    const id = idOf(e);
    if (id === undefined) return;
    const prev = firstIndex.get(id);
    if (prev !== undefined) add({ path: ["elements", i, "id"], message: `duplicate id "${id}": elements[${prev}] already uses it` });
    else firstIndex.set(id, i);
  });
  const byId = new Map<string, Loose>();
  for (const e of els) {
    const id = idOf(e);
    if (id !== undefined && !byId.has(id)) byId.set(id, e);
  }

  const roots = els.map((e, i) => ({ e, i })).filter(({ e }) => e.parent === null);
  if (roots.length === 0) {
    if (els.length > 0) add({ path: ["elements"], message: "no board: exactly one element, the board, must have parent null" });
  } else if (roots.length > 1) {
    for (const { e, i } of roots.slice(1)) {
      add({
        path: ["elements", i, "parent"],
        message: `two roots: "${idOf(e) ?? "?"}" has no parent, but "${idOf(roots[0].e) ?? "?"}" is already the board; every other element must sit on a parent`,
      });
    }
  }
  for (const { e, i } of roots) {
    if (typeof e.kind === "string" && e.kind !== "board")
      add({
        path: ["elements", i, "kind"],
        message: `"${idOf(e) ?? "?"}" has no parent, so it must be the board (kind "board"), not a ${e.kind}`,
      });
  }

  els.forEach((e, i) => {
    const id = idOf(e) ?? "?";
    if (e.kind === "board" && typeof e.parent === "string") {
      add({
        path: ["elements", i, "kind"],
        message: `"${id}" is a board but sits on "${e.parent}": only the root element can be the board`,
      });
    }
    if (typeof e.parent === "string") {
      if (e.parent === id) add({ path: ["elements", i, "parent"], message: `"${id}" cannot sit on itself` });
      else if (!byId.has(e.parent))
        add({ path: ["elements", i, "parent"], message: `unknown parent "${e.parent}": no element has that id` });
    }
    if (e.parent === null) {
      for (const key of ["bondLine", "placementTol", "tiltTol", "position", "yawDeg"]) {
        if (e[key] !== undefined) add({ path: ["elements", i, key], message: `the board is the reference frame: it has no ${key}` });
      }
    }
    checkRows(e, i, add);
    if (e.axisTol !== undefined && typeof e.kind === "string" && !isSensorKind(e.kind)) {
      add({
        path: ["elements", i, "axisTol"],
        message: `axisTol (sensing-axis alignment) applies to sensor dies only (gyro, accel, mag), not to a ${e.kind}`,
      });
    }
  });

  const sensorIdx = els.map((e, i) => (typeof e.kind === "string" && isSensorKind(e.kind) ? i : -1)).filter((i) => i >= 0);
  if (sensorIdx.length > MAX_SENSORS) {
    add({
      path: ["elements", sensorIdx[MAX_SENSORS]],
      message: `a stack may hold at most ${MAX_SENSORS} sensor dies (this one has ${sensorIdx.length}): split it into several stacks`,
    });
  }

  // Cycles: follow the parents from each element, marking every element a walk passes; a walk
  // that meets its own marks has found a cycle, one that meets an earlier walk's marks stops
  // there. Each element is walked once: linear in the number of elements.
  const walkOf = new Map<string, number>();
  els.forEach((e, i) => {
    const start = idOf(e);
    if (start === undefined || walkOf.has(start)) return;
    const path: string[] = [];
    let cur: Loose | undefined = e;
    while (cur) {
      const cid = idOf(cur);
      if (cid === undefined) break;
      const mark = walkOf.get(cid);
      if (mark !== undefined) {
        if (mark === i) {
          // told from the element of the loop that comes first in the file
          const found = path.slice(path.indexOf(cid));
          const k = found.reduce((best, id, j) => ((firstIndex.get(id) ?? 0) < (firstIndex.get(found[best]) ?? 0) ? j : best), 0);
          const loop = [...found.slice(k), ...found.slice(0, k)];
          add({
            path: ["elements", firstIndex.get(loop[0]) ?? i, "parent"],
            message: `cycle: ${cycleWords(loop)}; none of them rests on the board`,
          });
        }
        break;
      }
      walkOf.set(cid, i);
      path.push(cid);
      if (typeof cur.parent !== "string" || cur.parent === cid) break;
      cur = byId.get(cur.parent);
    }
  });

  // Geometry: support points and positions inside footprints.
  const tolMm = 1e-9;
  const sizeOf = (e: Loose) =>
    isObj(e.size) && isNum(e.size.x) && isNum(e.size.y) && e.size.x > 0 && e.size.y > 0 ? { x: e.size.x, y: e.size.y } : undefined;
  els.forEach((e, i) => {
    const id = idOf(e) ?? "?";
    const size = sizeOf(e);
    const s = isObj(e.bondLine) ? e.bondLine.supports : undefined;
    if (Array.isArray(s)) {
      const pts = s.filter((p): p is { x: number; y: number } => isObj(p) && isNum(p.x) && isNum(p.y));
      if (s.length < 3) {
        add({
          path: ["elements", i, "bondLine", "supports"],
          message: `"${id}" rests on ${s.length} support point${s.length === 1 ? "" : "s"}: a bond-line plane needs at least three`,
        });
      }
      if (size) {
        const hx = size.x / 2,
          hy = size.y / 2;
        s.forEach((p, j) => {
          if (isObj(p) && isNum(p.x) && isNum(p.y) && (Math.abs(p.x) > hx + tolMm || Math.abs(p.y) > hy + tolMm)) {
            add({
              path: ["elements", i, "bondLine", "supports", j],
              message: `support point (${fmt(p.x)}, ${fmt(p.y)}) mm lies outside the ${fmt(size.x)} x ${fmt(size.y)} mm footprint of "${id}" (it needs |x| <= ${fmt(hx)} and |y| <= ${fmt(hy)}, in the element's own frame)`,
            });
          }
        });
        if (pts.length === s.length && pts.length >= 3 && collinear(pts, Math.max(size.x, size.y))) {
          add({
            path: ["elements", i, "bondLine", "supports"],
            message: `the support points of "${id}" all lie on one line: the die would rock and the bond-line plane is undefined`,
          });
        }
      }
    }
    if (typeof e.parent === "string" && isObj(e.position) && isNum(e.position.x) && isNum(e.position.y)) {
      const p = byId.get(e.parent);
      const ps = p ? sizeOf(p) : undefined;
      if (p && ps && (Math.abs(e.position.x) > ps.x / 2 + tolMm || Math.abs(e.position.y) > ps.y / 2 + tolMm)) {
        add({
          path: ["elements", i, "position"],
          message: `the centre of "${id}" at (${fmt(e.position.x)}, ${fmt(e.position.y)}) mm is off the ${fmt(ps.x)} x ${fmt(ps.y)} mm top face of its parent "${idOf(p)}"`,
        });
      }
    }
  });
}

/** "a" sits on "b" sits on "a"; a long loop is shortened to its first and last links. */
function cycleWords(loop: string[]): string {
  const q = (s: string) => `"${s}"`;
  if (loop.length <= 6) return [...loop, loop[0]].map(q).join(" sits on ");
  return `${loop.slice(0, 3).map(q).join(" sits on ")} sits on … (${loop.length} elements) … sits on ${[...loop.slice(-2), loop[0]].map(q).join(" sits on ")}`;
}

/**
 * Measured rows belong to a source with several draws, one value per draw: the bond line
 * (one per support point), the tilt's `xy` (two) and a single axisTol (six). Anywhere else
 * a tolerance has one draw and takes `values`.
 */
function checkRows(e: Loose, i: number, add: (i: { path: (string | number)[]; message: string }) => void) {
  const width = (t: unknown) => (isObj(t) && Array.isArray(t.rows) && Array.isArray(t.rows[0]) ? (t.rows[0] as unknown[]).length : null);
  const bl = isObj(e.bondLine) ? e.bondLine : undefined;
  const blw = width(bl?.heightTol);
  if (blw !== null) {
    const s = bl!.supports;
    const need = Array.isArray(s) ? s.length : 4;
    if (blw !== need)
      add({
        path: ["elements", i, "bondLine", "heightTol", "rows"],
        message: `each row needs one height per support point (${need}), not ${blw}`,
      });
  }
  const tt = isObj(e.tiltTol) ? e.tiltTol : undefined;
  if (tt) {
    const w = width(tt.xy);
    if (tt.xy !== undefined && (tt.x !== undefined || tt.y !== undefined))
      add({ path: ["elements", i, "tiltTol", "xy"], message: "tiltTol.xy takes the place of x and y: give one or the other" });
    if (tt.xy !== undefined && w !== 2)
      add({ path: ["elements", i, "tiltTol", "xy"], message: "tiltTol.xy is measured rows of two values (x, y)" });
    for (const k of ["x", "y"])
      if (width(tt[k]) !== null)
        add({
          path: ["elements", i, "tiltTol", k, "rows"],
          message: "a single tilt component takes values, not rows: measured x and y together go in tiltTol.xy",
        });
  }
  const ax = e.axisTol;
  if (ax !== undefined && !Array.isArray(ax) && width(ax) !== null && width(ax) !== 6) {
    add({ path: ["elements", i, "axisTol", "rows"], message: "each row of axis angles holds six values, g1 to g6" });
  }
  if (Array.isArray(ax))
    ax.forEach(
      (t, k) => width(t) !== null && add({ path: ["elements", i, "axisTol", k, "rows"], message: "one axis angle takes values, not rows" }),
    );
  if (width(e.bowUm) !== null) add({ path: ["elements", i, "bowUm", "rows"], message: "the bow takes values, not rows" });
  const pl = isObj(e.placementTol) ? e.placementTol : undefined;
  for (const k of ["xUm", "yUm", "yawDeg"])
    if (pl && width(pl[k]) !== null)
      add({ path: ["elements", i, "placementTol", k, "rows"], message: "a placement tolerance takes values, not rows" });
}

/**
 * Points on one line (within a relative tolerance of the footprint). Linear: the line through
 * the first point and the point farthest from it, and the largest triangle any other point
 * makes with those two. Every point lies on one line exactly when that area is zero.
 */
function collinear(pts: { x: number; y: number }[], scale: number): boolean {
  const a = pts[0];
  let b = a;
  let far = 0;
  for (const p of pts) {
    const d = (p.x - a.x) ** 2 + (p.y - a.y) ** 2;
    if (d > far) [far, b] = [d, p];
  }
  let best = 0;
  for (const c of pts) {
    const area = Math.abs((b.x - a.x) * (c.y - a.y) - (c.x - a.x) * (b.y - a.y));
    if (area > best) best = area;
  }
  return best <= 1e-9 * scale * scale;
}

/** The stack file with every check: use this to parse. */
export const StackFileSchema = StackFileObjectSchema.superRefine((file, ctx) => {
  checkStack(file, (i) => ctx.addIssue({ code: "custom", path: i.path, message: i.message }));
});

export type StackValidation = { ok: true; stack: StackFile } | { ok: false; issues: FieldError[] };

/** Validate a parsed JSON value as a stack file. Reports every problem, not just the first. */
export function validateStackFile(json: unknown): StackValidation {
  const r = StackFileObjectSchema.safeParse(json);
  const issues: FieldError[] = r.success ? [] : fromZodError(r.error);
  // past a size limit, the file is refused on its size: the checks across elements never see it
  if (!r.success && r.error.issues.some(isSizeIssue)) return { ok: false, issues: dedupe(issues) };
  checkStack(json, (i) => issues.push({ path: formatPath(i.path), message: i.message }));
  if (r.success && issues.length === 0) return { ok: true, stack: r.data };
  return { ok: false, issues: dedupe(issues) };
}
