/**
 * The study file (MODEL.md section 9, `"format": "orthostack.study/1"`), plus the options
 * the product needs beyond MODEL.md: sampling ("random" or Latin hypercube "lhs"),
 * adaptive stopping (JCGM 101 section 7.9), the compass sensors, the number of worst
 * trials kept. `site` belongs to the API, which resolves it to `inclinationDeg`; the
 * engine accepts it and ignores it.
 */
import * as z from "zod";
import { text } from "./common";
import { headingPair, metricIds } from "../engine/compile";
import { type FieldError, type StackFile, dedupe, formatPath, fromZodError, isSensorKind, MetaSchema, ToleranceSchema } from "./stack-file";

export const MAX_TRIALS = 10_000_000;
export const MAX_ATTITUDES = 20_000;
export const MAX_WORST_TRIALS = 50;

const num = (what: string) => z.number({ error: (iss) => (iss.input === undefined ? `${what} is required` : `${what} must be a number`) });

export const TiltSchema = z.strictObject({
  pitchDeg: num("pitchDeg").gt(-90, { error: "pitch must lie strictly between -90 and 90 deg: at ±90 the heading is undefined" }).lt(90, {
    error: "pitch must lie strictly between -90 and 90 deg: at ±90 the heading is undefined",
  }),
  rollDeg: num("rollDeg")
    .gte(-180, { error: "roll must lie between -180 and 180 deg" })
    .lte(180, { error: "roll must lie between -180 and 180 deg" }),
});

export const RequirementSchema = z.strictObject({
  metric: text({ error: 'a requirement names a metric id, e.g. "heading.maxAbsDeg"' }).min(1),
  max: num("the limit max").gt(0, { error: "the limit max is an upper bound on |value| and must be greater than 0" }),
  yield: num("the yield target")
    .gt(0, { error: "the yield target is a fraction between 0 and 1 (e.g. 0.9973)" })
    .lt(1, { error: "the yield target must be below 1: a yield of exactly 1 cannot be shown by sampling" }),
  name: text().max(200).optional(),
});

export const CalibrationSchema = z.strictObject({
  after: z.enum(["none", "package", "board"], {
    error: (iss) => `calibration.after must be "none", "package" or "board", not ${JSON.stringify(iss.input)}`,
  }),
  residualDeg: ToleranceSchema.optional(),
});

export const AdaptiveSchema = z.strictObject({
  /** significant digits of u(y) that must be stable (JCGM 101 7.9: 1 or 2) */
  significantDigits: z.union([z.literal(1), z.literal(2)], { error: "significantDigits must be 1 or 2" }).optional(),
  /** metrics to stabilise; default: the requirement metrics (or heading.maxAbsDeg / the first metric) */
  metrics: z.array(text()).min(1).max(20).optional(),
  /** coverage probability p for metrics that carry no requirement; default 0.95 */
  coverage: num("coverage").gt(0).lt(1, { error: "coverage must lie between 0 and 1" }).optional(),
});

/** The file's shape alone (extendable with `.extend`). */
export const StudyFileObjectSchema = z.strictObject({
  format: z.literal("orthostack.study/1", { error: `format must be "orthostack.study/1"` }),
  name: text().max(200).optional(),
  notes: text().max(5000).optional(),
  meta: MetaSchema.optional(),
  trials: z
    .number({ error: (iss) => (iss.input === undefined ? "trials is required" : "trials must be a whole number") })
    .int({ error: "trials must be a whole number" })
    .min(1, { error: `trials must lie between 1 and ${MAX_TRIALS.toLocaleString("en-US")}` })
    .max(MAX_TRIALS, { error: `trials must lie between 1 and ${MAX_TRIALS.toLocaleString("en-US")}` }),
  seed: z
    .number({ error: (iss) => (iss.input === undefined ? "seed is required" : "seed must be a whole number") })
    .int({ error: "seed must be a whole number" })
    .min(0, { error: "seed cannot be negative" })
    .max(Number.MAX_SAFE_INTEGER, { error: "seed is too large" }),
  inclinationDeg: num("inclinationDeg (the field's dip)")
    .gt(-90, { error: "inclinationDeg must lie strictly between -90 and 90: at ±90 the horizontal field vanishes and there is no heading" })
    .lt(90, { error: "inclinationDeg must lie strictly between -90 and 90: at ±90 the horizontal field vanishes and there is no heading" }),
  headingStepDeg: num("headingStepDeg")
    .gt(0, { error: "headingStepDeg must be greater than 0" })
    .lte(360, { error: "headingStepDeg is at most 360" })
    .optional(),
  tilts: z.array(TiltSchema).min(1, { error: "tilts, when given, needs at least one attitude" }).max(200).optional(),
  calibration: CalibrationSchema.optional(),
  requirements: z.array(RequirementSchema).max(200).optional(),
  sampling: z.enum(["random", "lhs"], { error: `sampling must be "random" or "lhs" (Latin hypercube)` }).optional(),
  adaptive: AdaptiveSchema.optional(),
  headingSensors: z.strictObject({ accel: text(), mag: text() }).optional(),
  /** false switches the compass sweep off; true insists on it */
  heading: z.boolean().optional(),
  /**
   * How the sweep's max and RMS are evaluated (docs/engine.md): "screened" (default) sums a
   * series for the small errors and evaluates the large ones and the maximum exactly; "exact"
   * takes the angle of every attitude. Both give the same figures to about 1e-9 of their value.
   */
  headingEvaluation: z.enum(["screened", "exact"], { error: `headingEvaluation must be "screened" or "exact"` }).optional(),
  worstTrials: z
    .number()
    .int()
    .min(0)
    .max(MAX_WORST_TRIALS, { error: `worstTrials is at most ${MAX_WORST_TRIALS}` })
    .optional(),
  /** resolved to inclinationDeg by the API; not read by the engine */
  site: z.unknown().optional(),
});

export const StudyFileSchema = StudyFileObjectSchema;
export type StudyFile = z.infer<typeof StudyFileObjectSchema>;
export type Requirement = z.infer<typeof RequirementSchema>;

export type StudyValidation = { ok: true; study: StudyFile } | { ok: false; issues: FieldError[] };

/** Checks that need the stack: metric ids, compass sensors, attitude count. */
export function checkStudyAgainstStack(study: StudyFile, stack: StackFile): FieldError[] {
  const issues: FieldError[] = [];
  const add = (path: (string | number)[], message: string) => issues.push({ path: formatPath(path), message });
  const kinds = new Map(stack.elements.map((e) => [e.id, e.kind] as const));

  if (study.headingSensors) {
    const { accel, mag } = study.headingSensors;
    if (kinds.get(accel) !== "accel")
      add(
        ["headingSensors", "accel"],
        kinds.has(accel) ? `"${accel}" is a ${kinds.get(accel)}, not an accelerometer` : `no element "${accel}" in the stack`,
      );
    if (kinds.get(mag) !== "mag")
      add(
        ["headingSensors", "mag"],
        kinds.has(mag) ? `"${mag}" is a ${kinds.get(mag)}, not a magnetometer` : `no element "${mag}" in the stack`,
      );
  }
  const hasPair = study.headingSensors ? issues.length === 0 : headingPair(stack, study) !== null;
  const wantsHeading =
    study.heading === true || study.headingSensors !== undefined || (study.requirements ?? []).some((r) => r.metric.startsWith("heading."));
  const noCompass = () => {
    const missing = [
      stack.elements.some((e) => e.kind === "accel") ? null : "an accelerometer",
      stack.elements.some((e) => e.kind === "mag") ? null : "a magnetometer",
    ].filter(Boolean);
    return `the compass heading needs an accelerometer and a magnetometer, and this stack has no ${missing.join(" and no ") || "usable pair"}`;
  };
  if (wantsHeading && study.heading !== false && !hasPair && !study.headingSensors)
    add(study.heading === true ? ["heading"] : [], noCompass());
  if (study.heading === false && (study.requirements ?? []).some((r) => r.metric.startsWith("heading."))) {
    add(["heading"], "heading is switched off, but a requirement is on a heading metric");
  }

  const ids = new Set(hasPair || study.heading === false ? metricIds(stack, study) : metricIds(stack, { ...study, heading: false }));
  const sensorIds = stack.elements.filter((e) => isSensorKind(e.kind)).map((e) => e.id);
  const hint = (metric: string) => {
    const head = metric.split(/[.~]/)[0];
    if (metric.startsWith("heading.")) return hasPair ? ` (heading metrics are heading.maxAbsDeg and heading.rmsDeg)` : `: ${noCompass()}`;
    if (!kinds.has(head)) return `: there is no element "${head}" in the stack`;
    if (!sensorIds.includes(head) && !metric.endsWith(".tiltDeg"))
      return `: "${head}" is a ${kinds.get(head)}, and only sensors have cross-axis, misalignment and relative-rotation metrics`;
    return "";
  };
  (study.requirements ?? []).forEach((r, i) => {
    if (!ids.has(r.metric)) add(["requirements", i, "metric"], `the stack has no metric "${r.metric}"${hint(r.metric)}`);
  });
  (study.adaptive?.metrics ?? []).forEach((m, i) => {
    if (!ids.has(m)) add(["adaptive", "metrics", i], `the stack has no metric "${m}"${hint(m)}`);
  });

  const nAtt = sweepAttitudes(study);
  if (nAtt > MAX_ATTITUDES)
    add(
      ["headingStepDeg"],
      `the sweep would have ${nAtt} attitudes; the limit is ${MAX_ATTITUDES}: use a larger headingStepDeg or fewer tilts`,
    );
  if (study.calibration && study.calibration.after === "none" && study.calibration.residualDeg) {
    add(["calibration", "residualDeg"], `a calibration residual needs a calibration stage: set "after" to "package" or "board"`);
  }
  return issues;
}

/** Attitudes of the compass sweep for each trial: headings × tilts. */
export function sweepAttitudes(study: Pick<StudyFile, "headingStepDeg" | "tilts">): number {
  return Math.ceil(360 / (study.headingStepDeg ?? 10) - 1e-9) * (study.tilts?.length ?? 5);
}

/**
 * The work a study asks of the engine: trials × the sweep's attitudes, or trials alone when no
 * sweep runs (heading off, or no accelerometer and magnetometer). Without the stack, a sweep is
 * assumed unless the study switches heading off.
 */
export function studyWork(study: StudyFile, stack?: StackFile): { attitudes: number; work: number } {
  const sweeps = study.heading !== false && (stack ? study.headingSensors !== undefined || headingPair(stack, study) !== null : true);
  const attitudes = sweeps ? sweepAttitudes(study) : 1;
  return { attitudes, work: study.trials * attitudes };
}

/** Validate a parsed JSON value as a study of the given (already validated) stack. */
export function validateStudy(json: unknown, stack: StackFile): StudyValidation {
  const r = StudyFileObjectSchema.safeParse(json);
  if (!r.success) return { ok: false, issues: dedupe(fromZodError(r.error)) };
  const issues = checkStudyAgainstStack(r.data, stack);
  if (issues.length > 0) return { ok: false, issues: dedupe(issues) };
  return { ok: true, study: r.data };
}
