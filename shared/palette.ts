/**
 * The palette of DESIGN.md ("Look"): the one source of every colour of the product. The
 * client's Tailwind theme (frontend/styles/palette.css, written from `themeCss()` by
 * `npm run palette`; a test fails when it drifts), the study charts, the 3D view and the PDF
 * all read it.
 */
import type { ElementKind } from "./schemas/stack-file";

export const PALETTE = {
  ink: "#17212b",
  paper: "#f7f5f0",
  line: "#d9d4c7",
  panel: "#fffefb",
  gyro: "#4f46e5",
  accel: "#0d9488",
  mag: "#e4572e",
  asic: "#64748b",
  substrate: "#7c8b4f",
  board: "#2f4f3f",
  pass: "#15803d",
  fail: "#b91c1c",
  /** a warning that does not block: geometry slips of a stack */
  warn: "#b45309",
} satisfies Record<string, string>;
export type PaletteName = keyof typeof PALETTE;

/** Each element kind's colour; a spacer is bare silicon or glass: the neutral "line". */
export const KIND_COLOUR: Record<ElementKind, string> = {
  board: PALETTE.board,
  substrate: PALETTE.substrate,
  asic: PALETTE.asic,
  spacer: PALETTE.line,
  gyro: PALETTE.gyro,
  accel: PALETTE.accel,
  mag: PALETTE.mag,
};

/** The dimensioned drawing of a stack (report PDF, editor): its sheet and the bond lines in the side section. */
export const DRAWING_COLOUR = { sheet: "#fbfaf7", bondLine: "#c9a227" } as const;

/** The palette as Tailwind v4 theme variables (`--color-ink` → classes `text-ink`, `bg-ink`…). */
export function themeCss(): string {
  const lines = Object.entries(PALETTE).map(([name, hex]) => `  --color-${name}: ${hex};`);
  return `/* Written by \`npm run palette\` from shared/palette.ts: edit that file, not this one. */\n@theme {\n${lines.join("\n")}\n}\n`;
}
