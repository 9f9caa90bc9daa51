/** Shared looks for the study charts (recharts), in the palette of DESIGN.md (shared/palette.ts). */
import { KIND_COLOUR, PALETTE } from "@shared/palette";

export const INK = PALETTE.ink;
export const LINE = PALETTE.line;
export const PAPER = PALETTE.paper;
export const PASS = PALETTE.pass;
export const FAIL = PALETTE.fail;
export const SENSOR_COLOUR: Record<string, string> = KIND_COLOUR;
/** Study A and study B wherever two are drawn together. */
export const SERIES_A = PALETTE.gyro;
export const SERIES_B = PALETTE.mag;

export const axisTick = { fontSize: 10.5, fill: "rgba(23,33,43,0.62)", fontFamily: "Manrope, sans-serif" } as const;
export const axisLine = { stroke: LINE } as const;
export const gridProps = { stroke: LINE, strokeOpacity: 0.65, strokeDasharray: "2 3" } as const;
export const axisLabel = (value: string, angle = 0) =>
  ({
    value,
    angle,
    fontSize: 10.5,
    fill: "rgba(23,33,43,0.55)",
    fontWeight: 600,
    position: angle ? "insideLeft" : "insideBottom",
  }) as const;
export const tooltipStyle = {
  contentStyle: {
    background: PALETTE.panel,
    border: `1px solid ${LINE}`,
    borderRadius: 6,
    fontSize: 12,
    padding: "6px 8px",
    boxShadow: "0 4px 14px -4px rgba(23,33,43,0.18)",
  },
  labelStyle: { color: INK, fontWeight: 700, marginBottom: 2 },
  itemStyle: { padding: 0 },
} as const;

/**
 * Width of a vertical axis that holds its longest tick label whole (signs included): about
 * 0.62 em per character of Manrope at the tick size, plus the tick gap.
 */
export function axisWidthFor(labels: string[], min = 30): number {
  const longest = Math.max(0, ...labels.map((l) => l.length));
  return Math.max(min, Math.ceil(longest * axisTick.fontSize * 0.62 + 10));
}
