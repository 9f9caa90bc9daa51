/** Shared looks for the study charts (recharts), in the palette of DESIGN.md. */

export const INK = "#17212b";
export const LINE = "#d9d4c7";
export const PAPER = "#f7f5f0";
export const PASS = "#15803d";
export const FAIL = "#b91c1c";
export const SENSOR_COLOUR: Record<string, string> = {
  gyro: "#4f46e5",
  accel: "#0d9488",
  mag: "#e4572e",
  asic: "#64748b",
  substrate: "#7c8b4f",
  board: "#2f4f3f",
  spacer: "#64748b",
};
/** Study A and study B wherever two are drawn together. */
export const SERIES_A = "#4f46e5";
export const SERIES_B = "#e4572e";

export const axisTick = { fontSize: 10.5, fill: "rgba(23,33,43,0.62)", fontFamily: "Manrope, sans-serif" } as const;
export const axisLine = { stroke: LINE } as const;
export const gridProps = { stroke: LINE, strokeOpacity: 0.65, strokeDasharray: "2 3" } as const;
export const axisLabel = (value: string, angle = 0) =>
  ({ value, angle, fontSize: 10.5, fill: "rgba(23,33,43,0.55)", fontWeight: 600, position: angle ? "insideLeft" : "insideBottom" }) as const;
export const tooltipStyle = {
  contentStyle: {
    background: "#fffefb",
    border: `1px solid ${LINE}`,
    borderRadius: 6,
    fontSize: 12,
    padding: "6px 8px",
    boxShadow: "0 4px 14px -4px rgba(23,33,43,0.18)",
  },
  labelStyle: { color: INK, fontWeight: 700, marginBottom: 2 },
  itemStyle: { padding: 0 },
} as const;
