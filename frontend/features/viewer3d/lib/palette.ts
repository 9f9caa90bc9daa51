/**
 * Colours of the 3D view. The element colours are DESIGN.md's palette (the same values as
 * the theme in styles/app.css); the viewport adds a few of its own that the light pages
 * never use: the dark background, the grid, and the three sensing-axis colours, chosen so
 * that none of them shares a hue with a die (a test finds the dies by hue).
 */
import type { ElementKind } from "@shared/schemas/stack-file";

export const KIND_COLOUR: Record<ElementKind, string> = {
  board: "#2f4f3f",
  substrate: "#7c8b4f",
  asic: "#64748b",
  // a spacer is bare silicon or glass: the neutral "line" colour of the palette
  spacer: "#d9d4c7",
  gyro: "#4f46e5",
  accel: "#0d9488",
  mag: "#e4572e",
};

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

export const INK = "#17212b";
export const PAPER = "#f7f5f0";
export const LINE = "#d9d4c7";

/** Viewport background, top and bottom of its vertical gradient (shades of ink). */
export const VIEWPORT_TOP = "#243240";
export const VIEWPORT_BOTTOM = "#0f161d";

/** Bond lines: translucent paper, so the adhesive reads as a pale layer between dies. */
export const BOND_LINE = PAPER;
export const BOND_LINE_OPACITY = 0.5;

/** Sensing axes: amber, orchid and paper white (x, y, z). */
export const AXIS_COLOUR = ["#f2b33d", "#d77be8", "#f7f5f0"] as const;
export const AXIS_NAMES = ["x", "y", "z"] as const;

export const GRID_MINOR = "#c9d4cc";
export const GRID_MAJOR = "#e8efe9";
export const SECTION_OUTLINE = "#f7f5f0";
/** The selected element's outline: paper white, drawn over everything. */
export const SELECTION = "#ffffff";
