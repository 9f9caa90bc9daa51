/**
 * Words for the places of a stack and its requirements, so a person never reads a JSON
 * path or a unit word of the file format: `elements[5].bondLine.thicknessUm` becomes
 * "mag: bond-line thickness (µm)". The API keeps the paths in `fields` (programs read them);
 * the editor, the import dialog and the problem lists show these labels.
 */

type Unit = "µm" | "°" | "mm";

/** A tolerance slot: its words and the unit of its numbers. */
const SLOTS: Record<string, { label: string; unit: Unit }> = {
  "bondLine.heightTol": { label: "bond-line height", unit: "µm" },
  "tiltTol.x": { label: "direct tilt about x", unit: "°" },
  "tiltTol.y": { label: "direct tilt about y", unit: "°" },
  "tiltTol.xy": { label: "direct tilt, x and y measured together", unit: "°" },
  "placementTol.xUm": { label: "placement offset x", unit: "µm" },
  "placementTol.yUm": { label: "placement offset y", unit: "µm" },
  "placementTol.yawDeg": { label: "placement rotation", unit: "°" },
  bowUm: { label: "bow", unit: "µm" },
  axisTol: { label: "sensing-axis alignment", unit: "°" },
};

/** The parts of a tolerance; `{u}` is the slot's unit. */
const TOLERANCE_PARTS: Record<string, string> = {
  dist: "distribution",
  tol: "± tolerance ({u})",
  sigmas: "sigmas",
  mean: "mean shift ({u})",
  values: "measured values",
  rows: "measured rows",
  stage: "stage",
  owner: "owner",
};

const PLAIN: Record<string, string> = {
  id: "id",
  kind: "kind",
  parent: "parent",
  name: "name",
  notes: "notes",
  meta: "notes for programs (meta)",
  stage: "stage",
  position: "position",
  "position.x": "position x (mm)",
  "position.y": "position y (mm)",
  yawDeg: "nominal yaw (°)",
  size: "size",
  "size.x": "length x (mm)",
  "size.y": "width y (mm)",
  "size.z": "thickness z (mm)",
  bondLine: "bond line",
  "bondLine.thicknessUm": "bond-line thickness (µm)",
  "bondLine.supports": "support points",
  tiltTol: "direct tilts",
  placementTol: "placement tolerances",
};

const REQUIREMENT_PARTS: Record<string, string> = {
  metric: "metric",
  max: "limit",
  yield: "yield target (%)",
  name: "name",
};

/** A field inside an element ("bondLine.thicknessUm", "axisTol[2].tol") in words. */
export function fieldLabel(field: string): string {
  if (field === "") return "the element";
  if (field in PLAIN) return PLAIN[field];
  const support = /^bondLine\.supports\[(\d+)\](?:\.([xy]))?$/.exec(field);
  if (support) return `support point ${Number(support[1]) + 1}${support[2] ? ` ${support[2]} (mm)` : ""}`;
  const axis = /^axisTol\[(\d)\](?:\.(\w+))?/.exec(field);
  if (axis) {
    const head = `axis angle g${Number(axis[1]) + 1}`;
    return axis[2] ? `${head}: ${(TOLERANCE_PARTS[axis[2]] ?? axis[2]).replace("{u}", "°")}` : head;
  }
  for (const [slot, { label, unit }] of Object.entries(SLOTS)) {
    if (field === slot) return label;
    if (field.startsWith(`${slot}.`)) {
      const part = field.slice(slot.length + 1).split(/[.[]/)[0];
      return `${label}: ${(TOLERANCE_PARTS[part] ?? part).replace("{u}", unit)}`;
    }
  }
  const top = field.split(/[.[]/)[0];
  return PLAIN[top] ?? top;
}

type StackLike = { elements?: ReadonlyArray<{ id?: unknown; name?: unknown }> } | null | undefined;

function elementName(stack: StackLike, index: number): string {
  const id = stack?.elements?.[index]?.id;
  return typeof id === "string" && id ? id : `element ${index + 1}`;
}

/**
 * A whole path (`elements[5].bondLine.thicknessUm`, the API's `stack.elements[...]`,
 * `requirements[0].yield`) as "mag: bond-line thickness (µm)", "requirement 1: yield target (%)".
 */
export function pathLabel(path: string, stack?: StackLike): string {
  const p = path.startsWith("stack.") ? path.slice(6) : path === "stack" ? "" : path;
  const el = /^elements\[(\d+)\]\.?(.*)$/.exec(p);
  if (el) {
    const name = elementName(stack, Number(el[1]));
    return el[2] ? `${name}: ${fieldLabel(el[2])}` : name;
  }
  const rq = /^requirements\[(\d+)\]\.?(.*)$/.exec(p);
  if (rq) return `requirement ${Number(rq[1]) + 1}${rq[2] ? `: ${REQUIREMENT_PARTS[rq[2]] ?? rq[2]}` : ""}`;
  if (p === "" || p === "elements") return p === "" ? "the stack" : "the list of elements";
  return PLAIN[p] ?? p;
}

/**
 * A validator's sentence as a person reads it: unit words become symbols, the file's keys
 * and element paths become words. Messages written for the file format stay true; only
 * their spelling of places changes.
 */
export function readableMessage(message: string, stack?: StackLike): string {
  return message
    .replace(/\(um\)/g, "(µm)")
    .replace(/(\d) um\b/g, "$1 µm")
    .replace(/\belements\[(\d+)\](?:\.[\w.[\]]+)?/g, (m) => `"${pathLabel(m, stack)}"`)
    .replace(/\btiltTol\.xy\b/g, "the tilt measured as x and y")
    .replace(/\baxisTol\b/g, "the sensing-axis alignment")
    .replace(/\bsize\.([xyz])\b/g, "$1")
    .replace(/"tol"/g, "± tolerance")
    .replace(/\byawDeg\b/g, "yaw (°)");
}

/** Words for the keys of study settings, what-if and as-built bodies (the API's `fields`). */
const SETTING_WORDS: Record<string, string> = {
  trials: "trials",
  seed: "seed",
  sampling: "sampling",
  adaptive: "adaptive stopping",
  significantDigits: "significant digits",
  inclinationDeg: "field inclination (°)",
  headingStepDeg: "heading step (°)",
  tilts: "attitudes",
  pitchDeg: "pitch (°)",
  rollDeg: "roll (°)",
  calibration: "calibration",
  after: "calibrate after",
  residualDeg: "residual (°)",
  dist: "distribution",
  tol: "± tolerance",
  sigmas: "sigmas",
  mean: "mean shift",
  headingSensors: "sensors of the heading",
  accel: "accelerometer",
  mag: "magnetometer",
  requirements: "requirements",
  site: "site",
  latitudeDeg: "latitude (°)",
  longitudeDeg: "longitude (°)",
  altitudeKm: "altitude (km)",
  date: "date",
  label: "label",
  parameter: "parameter",
  values: "values",
  free: "free sources",
  costs: "costs",
  bounds: "bounds",
  asBuilt: "measured sources",
  datasetId: "data set",
  column: "column",
  source: "source",
  format: "format",
};
const LIST_ITEM: Record<string, string> = {
  tilts: "attitude",
  values: "value",
  free: "free source",
  asBuilt: "measured source",
};

/** A key the tables above do not know, in words: `residualDeg` → "residual (°)", `fooBar` → "foo bar". */
function keyWords(key: string): string {
  const unit = /(Deg|Um|Mm|Km|Pct)$/.exec(key);
  const head = unit ? key.slice(0, -unit[1].length) : key;
  const words = head.replace(/([a-z0-9])([A-Z])/g, "$1 $2").toLowerCase();
  const sym = unit ? { Deg: "°", Um: "µm", Mm: "mm", Km: "km", Pct: "%" }[unit[1]] : "";
  return sym ? `${words} (${sym})` : words;
}

/**
 * Any place the API names in `fields` as a person reads it: a stack or requirement path as
 * `pathLabel` gives it, a study setting, what-if or as-built field in words
 * ("study.tilts[1].pitchDeg" → "attitude 2: pitch (°)", "values.3" → "value 4"). Never the path.
 */
export function placeLabel(path: string, stack?: StackLike): string {
  const p = path.replace(/^study\./, "");
  if (p === "" || p === "study") return "the study";
  if (/^(stack\.)?elements\b/.test(p) || /^requirements\[\d+\]/.test(p) || p === "stack") return pathLabel(p, stack);
  const parts = p.replace(/\[(\w+)\]/g, ".$1").split(".");
  const out: string[] = [];
  for (let i = 0; i < parts.length; i++) {
    const key = parts[i];
    const next = parts[i + 1];
    if ((key === "costs" || key === "bounds") && next !== undefined) {
      // the rest is a source id ("mag.bondLine"), a name of the model
      out.push(`${key === "costs" ? "cost" : "bounds"} of ${parts.slice(i + 1).join(".")}`);
      break;
    }
    if (next !== undefined && /^\d+$/.test(next) && LIST_ITEM[key]) {
      out.push(`${LIST_ITEM[key]} ${Number(next) + 1}`);
      i++;
    } else if (/^\d+$/.test(key)) out.push(`item ${Number(key) + 1}`);
    else out.push(SETTING_WORDS[key] ?? keyWords(key));
  }
  return out.join(": ");
}
