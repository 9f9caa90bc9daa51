/** Numbers and names as every report output shows them (PDF, spreadsheet, CSV, the report page). */
import { UNIT_LABEL, type SourceUnit } from "./sources";

export const reportCode = (number: number) => `TR-${String(number).padStart(4, "0")}`;

/** Significant digits without trailing noise: 0.0750 → "0.0750" (3 digits), 1250 → "1250". */
export function sig(v: number | null | undefined, digits = 3): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return "—";
  if (v === 0) return "0";
  const a = Math.abs(v);
  const decimals = Math.max(0, Math.min(6, digits - 1 - Math.floor(Math.log10(a))));
  return v.toFixed(decimals);
}

/** As the engineer wrote it, without floating-point tails. */
export function plain(v: number): string {
  return String(Math.round(v * 1e6) / 1e6);
}

export function pct(fraction: number, decimals = 2): string {
  return `${(fraction * 100).toFixed(decimals)} %`;
}

export function unitOf(u: SourceUnit): string {
  return UNIT_LABEL[u];
}

/** "±12 µm", "±0.3°" */
export function withUnit(v: number | null, u: SourceUnit, prefix = ""): string {
  if (v === null) return "—";
  return u === "deg" ? `${prefix}${v}°` : `${prefix}${v} µm`;
}

/** Three significant digits with the unit: "1.25 µm", "0.0750°". */
export function sigUnit(v: number | null, u: SourceUnit): string {
  if (v === null) return "—";
  return u === "deg" ? `${sig(v, 3)}°` : `${sig(v, 3)} µm`;
}

export function distLabel(dist: string, sigmas: number | null): string {
  if (dist === "normal") return sigmas && sigmas !== 3 ? `normal, ±${plain(sigmas)}σ` : "normal, ±3σ";
  if (dist === "data") return "measured data";
  return dist;
}
