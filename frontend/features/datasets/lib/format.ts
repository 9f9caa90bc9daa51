import { UNIT_TEXT, type MeasureUnit } from "@shared/datasets/units";

/** Unit text for a column or source unit ("µm", "°", "mrad"); empty for none. */
export function unitText(unit: string | null | undefined): string {
  if (!unit) return "";
  return UNIT_TEXT[unit as MeasureUnit] ?? unit;
}

/** A measured value with four significant digits, no exponent for ordinary sizes, a true minus sign. */
export function formatMeasure(v: number, digits = 4): string {
  if (!Number.isFinite(v)) return "—";
  if (v === 0) return "0";
  const a = Math.abs(v);
  let s: string;
  if (a >= 1e-4 && a < 1e6) {
    const decimals = Math.max(0, Math.min(8, digits - 1 - Math.floor(Math.log10(a))));
    s = a.toFixed(decimals);
    if (s.includes(".")) s = s.replace(/\.?0+$/, "");
  } else s = a.toExponential(digits - 1);
  return `${v < 0 ? "−" : ""}${s}`;
}

export function withUnit(v: number, unit: string | null | undefined, digits = 4): string {
  const u = unitText(unit);
  if (!u) return formatMeasure(v, digits);
  return u === "°" ? `${formatMeasure(v, digits)}°` : `${formatMeasure(v, digits)} ${u}`;
}

export function formatIndex(v: number): string {
  return Number.isFinite(v) ? v.toFixed(2) : "—";
}

/** ppm with sensible digits: 2700, 63, 0.57, < 0.01. */
export function formatPpm(v: number): string {
  if (!Number.isFinite(v)) return "—";
  if (v === 0) return "0";
  if (v < 0.01) return "< 0.01";
  if (v < 10) return v.toFixed(2);
  if (v < 100) return v.toFixed(1);
  return Math.round(v).toLocaleString("en-US");
}

export function formatBytes(n: number): string {
  if (n < 1024) return `${n} B`;
  if (n < 1024 * 1024) return `${(n / 1024).toFixed(1)} kB`;
  return `${(n / 1048576).toFixed(1)} MB`;
}

export const reportNumber = (r: { number: number; revision: number }) => `TR-${String(r.number).padStart(4, "0")} rev ${r.revision}`;

/** Round tick values (1, 2 or 5 × 10^k apart) covering [lo, hi], about `count` of them. */
export function niceTicks(lo: number, hi: number, count = 7): number[] {
  const span = hi - lo;
  if (!(span > 0) || !Number.isFinite(span)) return [lo];
  const raw = span / count;
  const mag = 10 ** Math.floor(Math.log10(raw));
  const f = raw / mag;
  const step = (f >= 7.5 ? 10 : f >= 3.5 ? 5 : f >= 1.5 ? 2 : 1) * mag;
  // ticks as whole multiples of the step, rounded to its decimals, so zero is 0 and not 1e-17
  const decimals = Math.max(0, 1 - Math.floor(Math.log10(step)));
  const out: number[] = [];
  for (let k = Math.ceil(lo / step - 1e-9); k * step <= hi + span * 1e-9; k++) out.push(Number((k * step).toFixed(decimals)) || 0);
  return out;
}
