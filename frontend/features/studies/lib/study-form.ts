/**
 * The study settings form: its values (as typed, so a half-typed number stays on screen),
 * the study file they make, and the way back from a stored study to the form.
 * The file is checked with the shared study schema and against the revision's stack
 * before anything is sent, with the same messages the server would give.
 */
import { checkStudyAgainstStack, StudyFileObjectSchema, type StudyFile } from "@shared/schemas/study-file";
import { SiteSchema, type FieldAtSite, type Site } from "@shared/schemas/site";
import { fromZodError, type FieldError, type StackFile } from "@shared/schemas/stack-file";
import type { CreateStudy } from "@shared/schemas/studies";
import { typicalOf } from "@shared/typical-tolerances";

/** The calibration residual a study starts from: the typical one (shared/typical-tolerances.ts), never ±0. */
export const TYPICAL_RESIDUAL = typicalOf("calibration.residualDeg", "calibration")!;

export const DEFAULT_TILTS = [
  { pitchDeg: 0, rollDeg: 0 },
  { pitchDeg: 30, rollDeg: 0 },
  { pitchDeg: -30, rollDeg: 0 },
  { pitchDeg: 0, rollDeg: 30 },
  { pitchDeg: 0, rollDeg: -30 },
];

export type ResidualDist = "normal" | "uniform" | "triangular";

export interface StudyFormValues {
  label: string;
  trials: string;
  seed: string;
  sampling: "random" | "lhs";
  adaptive: boolean;
  significantDigits: "1" | "2";
  fieldFrom: "typed" | "site";
  inclinationDeg: string;
  latitudeDeg: string;
  longitudeDeg: string;
  altitudeKm: string;
  date: string;
  headingStepDeg: string;
  tilts: { pitchDeg: string; rollDeg: string }[];
  calibrationAfter: "none" | "package" | "board";
  residualDist: ResidualDist;
  residualTol: string;
  residualSigmas: string;
  /** "" uses the stack's first accelerometer and magnetometer */
  headingAccel: string;
  headingMag: string;
}

export function randomSeed(): number {
  return Math.floor(Math.random() * 1_000_000);
}

export function defaultFormValues(seed = randomSeed()): StudyFormValues {
  return {
    label: "",
    trials: "200000",
    seed: String(seed),
    sampling: "random",
    adaptive: false,
    significantDigits: "2",
    fieldFrom: "typed",
    inclinationDeg: "60",
    latitudeDeg: "",
    longitudeDeg: "",
    altitudeKm: "0",
    date: "",
    headingStepDeg: "10",
    tilts: DEFAULT_TILTS.map((t) => ({ pitchDeg: String(t.pitchDeg), rollDeg: String(t.rollDeg) })),
    calibrationAfter: "none",
    residualDist: TYPICAL_RESIDUAL.dist,
    residualTol: String(TYPICAL_RESIDUAL.tol),
    residualSigmas: "3",
    headingAccel: "",
    headingMag: "",
  };
}

/** The form filled from a stored study (its frozen file and, when it had one, its site). */
export function formValuesFromStudy(study: StudyFile, site: Pick<FieldAtSite, "site"> | null, label = ""): StudyFormValues {
  const d = defaultFormValues(study.seed);
  const residual = study.calibration?.residualDeg;
  return {
    ...d,
    label,
    trials: String(study.trials),
    seed: String(study.seed),
    sampling: study.sampling ?? "random",
    adaptive: !!study.adaptive,
    significantDigits: study.adaptive?.significantDigits === 1 ? "1" : "2",
    fieldFrom: site ? "site" : "typed",
    inclinationDeg: String(study.inclinationDeg),
    latitudeDeg: site ? String(site.site.latitudeDeg) : "",
    longitudeDeg: site ? String(site.site.longitudeDeg) : "",
    altitudeKm: site ? String(site.site.altitudeKm) : "0",
    date: site ? site.site.date : "",
    headingStepDeg: String(study.headingStepDeg ?? 10),
    tilts: (study.tilts ?? DEFAULT_TILTS).map((t) => ({ pitchDeg: String(t.pitchDeg), rollDeg: String(t.rollDeg) })),
    calibrationAfter: study.calibration?.after ?? "none",
    residualDist: residual && residual.dist !== "data" ? residual.dist : "normal",
    residualTol: residual?.tol !== undefined ? String(residual.tol) : d.residualTol,
    residualSigmas: residual?.sigmas !== undefined ? String(residual.sigmas) : "3",
    headingAccel: study.headingSensors?.accel ?? "",
    headingMag: study.headingSensors?.mag ?? "",
  };
}

/** A typed number: "" and junk stay as they are so the schema names the field. */
function num(text: string): number | string | undefined {
  const t = text.trim().replace(/[\s,_]/g, "");
  if (t === "") return undefined;
  const n = Number(t);
  return Number.isFinite(n) ? n : text;
}

/** The site as typed, parsed; null while any part is missing or wrong. */
export function siteOf(v: StudyFormValues): Site | null {
  if (v.fieldFrom !== "site") return null;
  const r = SiteSchema.safeParse({
    latitudeDeg: num(v.latitudeDeg),
    longitudeDeg: num(v.longitudeDeg),
    altitudeKm: num(v.altitudeKm) ?? 0,
    date: v.date,
  });
  return r.success ? r.data : null;
}

export type FormErrors = Record<string, string>;

/** Form field names for the paths of the study file (and of the API's `study.` / `site.` fields). */
const FIELD_OF: Array<[RegExp, string]> = [
  [/^(study\.)?trials$/, "trials"],
  [/^(study\.)?seed$/, "seed"],
  [/^(study\.)?inclinationDeg$/, "inclinationDeg"],
  [/^(study\.)?headingStepDeg$/, "headingStepDeg"],
  [/^(study\.)?tilts\[(\d+)\]\.(pitchDeg|rollDeg)$/, "tilts.$2.$3"],
  [/^(study\.)?tilts/, "tilts"],
  [/^(study\.)?calibration\.residualDeg\.tol$/, "residualTol"],
  [/^(study\.)?calibration\.residualDeg\.sigmas$/, "residualSigmas"],
  [/^(study\.)?calibration\.residualDeg/, "residualTol"],
  [/^(study\.)?calibration/, "calibrationAfter"],
  [/^(study\.)?headingSensors\.accel$/, "headingAccel"],
  [/^(study\.)?headingSensors\.mag$/, "headingMag"],
  [/^(study\.)?adaptive/, "adaptive"],
  [/^(study\.)?sampling$/, "sampling"],
  [/^site\.(latitudeDeg|longitudeDeg|altitudeKm|date)$/, "$1"],
  [/^label$/, "label"],
];

export function fieldOfPath(path: string): string {
  for (const [re, field] of FIELD_OF) {
    const m = re.exec(path);
    if (m) return path.replace(re, field);
  }
  return "_form";
}

export function issuesToErrors(issues: FieldError[]): FormErrors {
  const out: FormErrors = {};
  for (const i of issues) {
    const key = fieldOfPath(i.path);
    if (!(key in out)) out[key] = i.message;
  }
  return out;
}

export type BuiltStudy = { ok: true; body: CreateStudy; study: StudyFile; attitudes: number } | { ok: false; errors: FormErrors };

/**
 * The request body for `POST /api/revisions/:id/studies`. Requirements are left out: the
 * server takes the revision's own. With a site, the server replaces the inclination by the
 * World Magnetic Model's; `fieldInclination` (the value shown on screen) stands in for it
 * in the file checked here.
 */
export function buildStudy(v: StudyFormValues, stack: StackFile | null, fieldInclination?: number | null): BuiltStudy {
  const errors: FormErrors = {};
  const file: Record<string, unknown> = {
    format: "orthostack.study/1",
    trials: num(v.trials),
    seed: num(v.seed),
    inclinationDeg: v.fieldFrom === "site" ? (fieldInclination ?? 0) : num(v.inclinationDeg),
    headingStepDeg: num(v.headingStepDeg),
    tilts: v.tilts.map((t) => ({ pitchDeg: num(t.pitchDeg), rollDeg: num(t.rollDeg) })),
    sampling: v.sampling,
  };
  if (v.calibrationAfter === "none") file.calibration = { after: "none" };
  else {
    const residual: Record<string, unknown> = { dist: v.residualDist, tol: num(v.residualTol) };
    if (v.residualDist === "normal" && v.residualSigmas.trim() !== "" && num(v.residualSigmas) !== 3)
      residual.sigmas = num(v.residualSigmas);
    file.calibration = { after: v.calibrationAfter, residualDeg: residual };
  }
  if (v.adaptive) file.adaptive = { significantDigits: v.significantDigits === "1" ? 1 : 2 };
  if (v.headingAccel || v.headingMag) {
    file.headingSensors = { accel: v.headingAccel, mag: v.headingMag };
    if (!v.headingAccel) errors.headingAccel = "choose the accelerometer too, or leave both on the first of each";
    if (!v.headingMag) errors.headingMag = "choose the magnetometer too, or leave both on the first of each";
  }
  if (v.tilts.length === 0) errors.tilts = "the sweep needs at least one attitude";

  let site: Site | undefined;
  if (v.fieldFrom === "site") {
    const r = SiteSchema.safeParse({
      latitudeDeg: num(v.latitudeDeg),
      longitudeDeg: num(v.longitudeDeg),
      altitudeKm: num(v.altitudeKm) ?? 0,
      date: v.date,
    });
    if (r.success) site = r.data;
    else
      for (const i of fromZodError(r.error))
        errors[fieldOfPath(`site.${i.path}`)] ??= i.message === "this field is required" ? requiredSite(i.path) : i.message;
  }

  const parsed = StudyFileObjectSchema.safeParse(file);
  if (!parsed.success) {
    for (const i of fromZodError(parsed.error)) {
      if (v.fieldFrom === "site" && i.path === "inclinationDeg") continue;
      const key = fieldOfPath(i.path);
      errors[key] ??= i.message;
    }
  } else if (stack) {
    for (const i of checkStudyAgainstStack(parsed.data, stack)) errors[fieldOfPath(i.path)] ??= i.message;
  }
  if (Object.keys(errors).length > 0 || !parsed.success) return { ok: false, errors };

  const study = parsed.data;
  const body: CreateStudy = { study };
  if (site) body.site = site;
  if (v.label.trim()) body.label = v.label.trim();
  return { ok: true, body, study, attitudes: attitudeCount(study) };
}

function requiredSite(path: string): string {
  return (
    { latitudeDeg: "latitude is required", longitudeDeg: "longitude is required", date: "date is required (YYYY-MM-DD)" }[path] ??
    "this field is required"
  );
}

/** Attitudes swept per trial: headings per turn × tilts. */
export function attitudeCount(study: Pick<StudyFile, "headingStepDeg" | "tilts">): number {
  return Math.ceil(360 / (study.headingStepDeg ?? 10) - 1e-9) * (study.tilts?.length ?? 5);
}
