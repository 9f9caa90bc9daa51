/**
 * Starting points for a new stack: package arrangements of our own design, each a valid
 * stack file whose tolerances are the typical ones (typical-tolerances.ts) and with a set
 * of requirements the system team usually asks for. The engineer replaces the sizes and
 * values with the real ones; the shape of the stack is what saves the time.
 * Read by `GET /api/stack-templates` and the new-revision flow of the editor.
 */
import type { StackElement, StackFile } from "./schemas/stack-file";
import type { Requirement } from "./schemas/study-file";
import { toleranceFrom, typicalForSlot } from "./typical-tolerances";

export interface StackTemplate {
  id: string;
  name: string;
  description: string;
  stack: StackFile;
  requirements: Requirement[];
}

type Part = Omit<StackElement, "bondLine" | "placementTol" | "bowUm" | "axisTol"> & { thicknessUm?: number };

/**
 * An element with the typical tolerances of its place: bond line, placement offset and
 * rotation, bow, and the sensing-axis alignment of a sensor die.
 */
function withTypical(part: Part, parentKind: string | undefined): StackElement {
  const { thicknessUm, ...el } = part;
  const typ = (slot: (string | number)[]) => {
    const t = typicalForSlot(el, slot, parentKind);
    return t ? toleranceFrom(t) : undefined;
  };
  const out: StackElement = { ...el };
  if (el.parent !== null) {
    out.bondLine = { ...(thicknessUm !== undefined ? { thicknessUm } : {}), heightTol: typ(["bondLine", "heightTol"]) };
    out.placementTol = { xUm: typ(["placementTol", "xUm"]), yUm: typ(["placementTol", "yUm"]), yawDeg: typ(["placementTol", "yawDeg"]) };
  }
  const bow = typ(["bowUm"]);
  if (bow) out.bowUm = bow;
  const axis = typ(["axisTol"]);
  if (axis) out.axisTol = axis;
  return out;
}

function stackOf(name: string, parts: Part[]): StackFile {
  const kinds = new Map(parts.map((p) => [p.id, p.kind] as const));
  return {
    format: "orthostack.stack/1",
    name,
    elements: parts.map((p) => withTypical(p, p.parent === null ? undefined : kinds.get(p.parent))),
  };
}

const Y = 0.9973;

export const STACK_TEMPLATES: readonly StackTemplate[] = [
  {
    id: "dies-on-asic",
    name: "Sensor dies stacked on an ASIC",
    description:
      "A land-grid package on the board; the ASIC on its substrate; the gyroscope on the ASIC with the accelerometer on top of it, and the magnetometer on the ASIC beside them, turned a quarter turn.",
    stack: stackOf("Sensor dies stacked on an ASIC", [
      { id: "board", kind: "board", parent: null, name: "Main board", size: { x: 30, y: 20, z: 1.0 } },
      {
        id: "pkg",
        kind: "substrate",
        parent: "board",
        name: "Package substrate, LGA 3.5 × 3",
        stage: "board",
        meta: { bodyHeightMm: 1.1 },
        position: { x: 0, y: 0 },
        size: { x: 3.5, y: 3.0, z: 0.2 },
        thicknessUm: 60,
      },
      {
        id: "asic",
        kind: "asic",
        parent: "pkg",
        name: "Readout ASIC",
        position: { x: 0, y: 0 },
        size: { x: 2.8, y: 2.4, z: 0.18 },
        thicknessUm: 20,
      },
      {
        id: "gyro",
        kind: "gyro",
        parent: "asic",
        name: "Gyroscope die",
        position: { x: -0.5, y: 0 },
        size: { x: 1.5, y: 1.3, z: 0.3 },
        thicknessUm: 15,
      },
      {
        id: "accel",
        kind: "accel",
        parent: "gyro",
        name: "Accelerometer die",
        position: { x: 0, y: 0 },
        size: { x: 1.0, y: 0.9, z: 0.25 },
        thicknessUm: 12,
      },
      {
        id: "mag",
        kind: "mag",
        parent: "asic",
        name: "Magnetometer die",
        position: { x: 0.85, y: 0 },
        yawDeg: 90,
        size: { x: 0.8, y: 0.6, z: 0.15 },
        thicknessUm: 10,
      },
    ]),
    requirements: [
      { metric: "heading.maxAbsDeg", max: 2, yield: Y, name: "Compass heading" },
      { metric: "accel~mag.relRotDeg", max: 1, yield: Y },
      { metric: "gyro~accel.relRotDeg", max: 1, yield: Y },
      { metric: "accel.crossAxisTotalPct.z", max: 2, yield: Y },
    ],
  },
  {
    id: "dies-side-by-side",
    name: "Dies side by side on a substrate",
    description:
      "One package substrate carrying the ASIC, the gyroscope, the accelerometer and the magnetometer next to each other, each attached to the substrate directly.",
    stack: stackOf("Dies side by side on a substrate", [
      { id: "board", kind: "board", parent: null, name: "Main board", size: { x: 30, y: 20, z: 1.0 } },
      {
        id: "pkg",
        kind: "substrate",
        parent: "board",
        name: "Package substrate, LGA 4 × 3",
        stage: "board",
        size: { x: 4.0, y: 3.0, z: 0.2 },
        thicknessUm: 60,
      },
      {
        id: "asic",
        kind: "asic",
        parent: "pkg",
        name: "Readout ASIC",
        position: { x: -1.05, y: 0 },
        size: { x: 1.6, y: 1.4, z: 0.18 },
        thicknessUm: 20,
      },
      {
        id: "accel",
        kind: "accel",
        parent: "pkg",
        name: "Accelerometer die",
        position: { x: 0.5, y: 0.6 },
        size: { x: 1.0, y: 0.9, z: 0.3 },
        thicknessUm: 15,
      },
      {
        id: "gyro",
        kind: "gyro",
        parent: "pkg",
        name: "Gyroscope die",
        position: { x: 0.6, y: -0.65 },
        size: { x: 1.2, y: 1.0, z: 0.3 },
        thicknessUm: 15,
      },
      {
        id: "mag",
        kind: "mag",
        parent: "pkg",
        name: "Magnetometer die",
        position: { x: 1.5, y: 0.6 },
        size: { x: 0.6, y: 0.5, z: 0.15 },
        thicknessUm: 10,
      },
    ]),
    requirements: [
      { metric: "heading.maxAbsDeg", max: 2, yield: Y, name: "Compass heading" },
      { metric: "accel~mag.relRotDeg", max: 1, yield: Y },
      { metric: "accel~gyro.relRotDeg", max: 1, yield: Y },
      { metric: "mag.tiltDeg", max: 1, yield: Y },
    ],
  },
  {
    id: "imu-and-separate-mag",
    name: "Inertial package beside a magnetometer package",
    description:
      "An inertial package (accelerometer and gyroscope side by side on their ASIC) and a separate magnetometer package, turned a quarter turn, each soldered to the board.",
    stack: stackOf("Inertial package beside a magnetometer package", [
      { id: "board", kind: "board", parent: null, name: "Main board", size: { x: 50, y: 30, z: 1.2 } },
      {
        id: "imu",
        kind: "substrate",
        parent: "board",
        name: "Inertial package substrate, LGA 3 × 2.5",
        stage: "board",
        position: { x: -4, y: 0 },
        size: { x: 3.0, y: 2.5, z: 0.2 },
        thicknessUm: 60,
      },
      {
        id: "asic",
        kind: "asic",
        parent: "imu",
        name: "Inertial ASIC",
        size: { x: 2.4, y: 2.0, z: 0.18 },
        thicknessUm: 20,
      },
      {
        id: "accel",
        kind: "accel",
        parent: "asic",
        name: "Accelerometer die",
        position: { x: -0.55, y: 0 },
        size: { x: 1.0, y: 0.9, z: 0.3 },
        thicknessUm: 15,
      },
      {
        id: "gyro",
        kind: "gyro",
        parent: "asic",
        name: "Gyroscope die",
        position: { x: 0.55, y: 0 },
        size: { x: 1.0, y: 1.0, z: 0.3 },
        thicknessUm: 15,
      },
      {
        id: "magpkg",
        kind: "substrate",
        parent: "board",
        name: "Magnetometer package, 2 × 2",
        stage: "board",
        position: { x: 6, y: 1 },
        yawDeg: 90,
        size: { x: 2.0, y: 2.0, z: 0.2 },
        thicknessUm: 60,
      },
      {
        id: "mag",
        kind: "mag",
        parent: "magpkg",
        name: "Magnetometer die",
        size: { x: 1.2, y: 1.2, z: 0.2 },
        thicknessUm: 12,
      },
    ]),
    requirements: [
      { metric: "heading.maxAbsDeg", max: 3, yield: Y, name: "Compass heading" },
      { metric: "accel~mag.relRotDeg", max: 1.5, yield: Y },
      { metric: "accel~gyro.relRotDeg", max: 1, yield: Y },
      { metric: "magpkg.tiltDeg", max: 1, yield: Y },
    ],
  },
];

export function templateById(id: string): StackTemplate | undefined {
  return STACK_TEMPLATES.find((t) => t.id === id);
}
