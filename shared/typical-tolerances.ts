/**
 * Typical tolerances: a starting value for every kind of source (MODEL.md section 8), so a
 * new tolerance never starts at ±0 and the editor can show what is usual beside what was
 * typed. These are facts of the trade as we know them ("common practice", from memory),
 * not a standard: the assembly house's own figures replace them (README, "Cautions").
 * Read by `GET /api/typical-tolerances`, the stack editor and the stack templates.
 */
import type { StackElement, Tolerance } from "./schemas/stack-file";

/** The kinds of source a stack or study has; the element slot or the study field. */
export const TYPICAL_KINDS = [
  "bondLine.heightTol",
  "bowUm",
  "placementTol.xUm",
  "placementTol.yUm",
  "placementTol.yawDeg",
  "tiltTol",
  "axisTol",
  "calibration.residualDeg",
] as const;
export type TypicalKind = (typeof TYPICAL_KINDS)[number];

/**
 * Which elements a value applies to: a die on a die or substrate ("die-attach"), a package
 * soldered to the board ("solder"), the board, a package substrate, a die's own bow, one
 * sensor kind, or the study's calibration.
 */
export const TYPICAL_APPLIES = ["die-attach", "solder", "board", "substrate", "die", "gyro", "accel", "mag", "calibration"] as const;
export type TypicalAppliesTo = (typeof TYPICAL_APPLIES)[number];

export interface TypicalTolerance {
  kind: TypicalKind;
  appliesTo: TypicalAppliesTo;
  /** what the value is, in words ("Die-attach bond-line height, per support") */
  label: string;
  dist: "normal" | "uniform" | "triangular";
  /** half-width; for "normal" it is 3 σ (MODEL.md section 8, sigmas defaults to 3) */
  tol: number;
  unit: "um" | "deg";
  note: string;
  /** "common practice", or the published source the value comes from */
  basis: string;
}

const CP = "common practice";

export const TYPICAL_TOLERANCES: readonly TypicalTolerance[] = [
  {
    kind: "bondLine.heightTol",
    appliesTo: "die-attach",
    label: "Die-attach bond-line height, per support",
    dist: "normal",
    tol: 5,
    unit: "um",
    note: "Dispensed epoxy or die-attach film under a die; film holds tighter (about ±3 µm), dispensed paste looser. From memory.",
    basis: CP,
  },
  {
    kind: "bondLine.heightTol",
    appliesTo: "solder",
    label: "Solder stand-off, per support",
    dist: "normal",
    tol: 15,
    unit: "um",
    note: "Stand-off of a reflowed land-grid or QFN package on the board; stencil thickness and paste volume set it. From memory.",
    basis: CP,
  },
  {
    kind: "bowUm",
    appliesTo: "board",
    label: "Board bow under the package",
    dist: "normal",
    tol: 60,
    unit: "um",
    note: "Local bow of the board over the part's area; the board-level limit for surface-mount boards is 0.75 % of the diagonal (IPC-6012, from memory), which is far more than the local bow under one package.",
    basis: CP,
  },
  {
    kind: "bowUm",
    appliesTo: "substrate",
    label: "Package substrate warpage",
    dist: "normal",
    tol: 8,
    unit: "um",
    note: "Laminate or ceramic substrate of a small sensor package after moulding and reflow. From memory.",
    basis: CP,
  },
  {
    kind: "bowUm",
    appliesTo: "die",
    label: "Die bow",
    dist: "normal",
    tol: 2,
    unit: "um",
    note: "Thinned silicon die after attach and cure; larger for thin dies on a stiff, mismatched attach. From memory.",
    basis: CP,
  },
  {
    kind: "placementTol.xUm",
    appliesTo: "die-attach",
    label: "Die placement offset x",
    dist: "normal",
    tol: 25,
    unit: "um",
    note: "Die bonder placement accuracy at 3 σ. From memory.",
    basis: CP,
  },
  {
    kind: "placementTol.yUm",
    appliesTo: "die-attach",
    label: "Die placement offset y",
    dist: "normal",
    tol: 25,
    unit: "um",
    note: "Die bonder placement accuracy at 3 σ. From memory.",
    basis: CP,
  },
  {
    kind: "placementTol.yawDeg",
    appliesTo: "die-attach",
    label: "Die placement rotation",
    dist: "normal",
    tol: 0.3,
    unit: "deg",
    note: "Die bonder rotation accuracy at 3 σ, with vision alignment on the die's fiducials. From memory.",
    basis: CP,
  },
  {
    kind: "placementTol.xUm",
    appliesTo: "solder",
    label: "Package placement offset x on the board",
    dist: "normal",
    tol: 50,
    unit: "um",
    note: "Pick-and-place accuracy plus self-alignment in reflow. From memory.",
    basis: CP,
  },
  {
    kind: "placementTol.yUm",
    appliesTo: "solder",
    label: "Package placement offset y on the board",
    dist: "normal",
    tol: 50,
    unit: "um",
    note: "Pick-and-place accuracy plus self-alignment in reflow. From memory.",
    basis: CP,
  },
  {
    kind: "placementTol.yawDeg",
    appliesTo: "solder",
    label: "Package rotation on the board",
    dist: "normal",
    tol: 0.8,
    unit: "deg",
    note: "A small package turns on its pads while the solder is molten; larger packages turn less. From memory.",
    basis: CP,
  },
  {
    kind: "tiltTol",
    appliesTo: "die-attach",
    label: "Direct tilt, each axis",
    dist: "normal",
    tol: 0.1,
    unit: "deg",
    note: "Only when the tilt is known as an angle rather than from support heights; leave it out when the bond line is given. From memory.",
    basis: CP,
  },
  {
    kind: "tiltTol",
    appliesTo: "solder",
    label: "Package tilt on the board, each axis",
    dist: "normal",
    tol: 0.3,
    unit: "deg",
    note: "Only when the tilt is known as an angle rather than from the solder stand-off. From memory.",
    basis: CP,
  },
  {
    kind: "axisTol",
    appliesTo: "gyro",
    label: "Gyroscope sensing-axis alignment, each angle",
    dist: "normal",
    tol: 0.6,
    unit: "deg",
    note: "MEMS gyroscope dies are commonly specified with a cross-axis sensitivity of about ±1 %, which is about 0.6°. From memory.",
    basis: CP,
  },
  {
    kind: "axisTol",
    appliesTo: "accel",
    label: "Accelerometer sensing-axis alignment, each angle",
    dist: "normal",
    tol: 0.6,
    unit: "deg",
    note: "MEMS accelerometer dies are commonly specified with a cross-axis sensitivity of about ±1 %, which is about 0.6°. From memory.",
    basis: CP,
  },
  {
    kind: "axisTol",
    appliesTo: "mag",
    label: "Magnetometer sensing-axis alignment, each angle",
    dist: "normal",
    tol: 1,
    unit: "deg",
    note: "Magnetometer dies (Hall or magnetoresistive) commonly state a cross-axis sensitivity of 1–2 %; ±1° is a middle value. From memory.",
    basis: CP,
  },
  {
    kind: "calibration.residualDeg",
    appliesTo: "calibration",
    label: "Calibration residual, each angle",
    dist: "normal",
    tol: 0.05,
    unit: "deg",
    note: "What a multi-position calibration leaves of the axis angles; set by the calibration rig's own accuracy. From memory.",
    basis: CP,
  },
];

/** The typical tolerance for one kind and one group of elements, if there is one. */
export function typicalOf(kind: TypicalKind, appliesTo: TypicalAppliesTo): TypicalTolerance | undefined {
  return TYPICAL_TOLERANCES.find((t) => t.kind === kind && t.appliesTo === appliesTo);
}

/** The slot of an element's tolerance as a kind: `["axisTol", 3]` → "axisTol", `["tiltTol", "x"]` → "tiltTol". */
export function kindOfSlot(slot: ReadonlyArray<string | number>): TypicalKind | undefined {
  const [a, b] = slot;
  if (a === "axisTol" || a === "tiltTol" || a === "bowUm") return a;
  const k = `${String(a)}.${String(b)}`;
  return (TYPICAL_KINDS as readonly string[]).includes(k) ? (k as TypicalKind) : undefined;
}

/**
 * The typical tolerance of a slot of an element (`slot` inside the element, e.g.
 * `["bondLine", "heightTol"]`): a part sitting on the board is soldered, anything else is
 * attached as a die; bows follow the element's own kind; axes follow the sensor kind.
 */
export function typicalForSlot(
  el: Pick<StackElement, "kind" | "parent">,
  slot: ReadonlyArray<string | number>,
  parentKind?: string,
): TypicalTolerance | undefined {
  const kind = kindOfSlot(slot);
  if (!kind) return undefined;
  if (kind === "bowUm") return typicalOf(kind, el.kind === "board" ? "board" : el.kind === "substrate" ? "substrate" : "die");
  if (kind === "axisTol") return el.kind === "gyro" || el.kind === "accel" || el.kind === "mag" ? typicalOf(kind, el.kind) : undefined;
  if (el.parent === null) return undefined;
  const onBoard = parentKind !== undefined ? parentKind === "board" : false;
  return typicalOf(kind, onBoard ? "solder" : "die-attach");
}

/** A tolerance of the file from a typical value. */
export function toleranceFrom(t: Pick<TypicalTolerance, "dist" | "tol">): Tolerance {
  return { dist: t.dist, tol: t.tol };
}
