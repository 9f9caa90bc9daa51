/**
 * Colours of the 3D view. The element colours are DESIGN.md's palette (shared/palette.ts,
 * the same source as the theme in styles/palette.css); the viewport adds a few of its own that the light pages
 * never use: the dark background, the grid, and the three sensing-axis colours, chosen so
 * that none of them shares a hue with a die (a test finds the dies by hue).
 */
import { KIND_COLOUR, PALETTE } from "@shared/palette";
import type { ElementKind } from "@shared/schemas/stack-file";

export { KIND_COLOUR };

export const KIND_LABEL: Record<ElementKind, string> = {
  board: "Board",
  substrate: "Substrate",
  asic: "ASIC",
  spacer: "Spacer",
  gyro: "Gyroscope",
  accel: "Accelerometer",
  mag: "Magnetometer",
};

export const KIND_ORDER: ElementKind[] = ["board", "substrate", "asic", "spacer", "gyro", "accel", "mag"];

export const INK = PALETTE.ink;
export const PAPER = PALETTE.paper;
export const LINE = PALETTE.line;

/** Viewport background, top and bottom of its vertical gradient (shades of ink). */
export const VIEWPORT_TOP = "#243240";
export const VIEWPORT_BOTTOM = "#0f161d";

/** Bond lines: translucent paper, so the adhesive reads as a pale layer between dies. */
export const BOND_LINE = PAPER;
export const BOND_LINE_OPACITY = 0.5;

/** Sensing axes: amber, orchid and paper white (x, y, z). */
export const AXIS_COLOUR = ["#f2b33d", "#d77be8", PALETTE.paper] as const;
export const AXIS_NAMES = ["x", "y", "z"] as const;

export const GRID_MINOR = "#c9d4cc";
export const GRID_MAJOR = "#e8efe9";
export const SECTION_OUTLINE = PALETTE.paper;
/** The selected element's outline: paper white, drawn over everything. */
export const SELECTION = "#ffffff";
