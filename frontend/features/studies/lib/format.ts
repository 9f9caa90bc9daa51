/**
 * How the study screens write numbers: angles in degrees with milliradians beside them,
 * cross-axis in %, yields as percentages with enough digits to tell them from 100 %.
 */

const grouped = new Intl.NumberFormat("en-US", { maximumFractionDigits: 0 });

/** 200000 → "200,000" */
export function formatCount(n: number): string {
  return Number.isFinite(n) ? grouped.format(Math.round(n)) : "—";
}

/** Three significant figures, at most four decimals; small values keep their figures. */
export function formatNumber(v: number, significant = 3): string {
  if (!Number.isFinite(v)) return "—";
  const a = Math.abs(v);
  if (a === 0) return "0";
  if (a >= 1000) return grouped.format(v);
  const digits = Math.max(0, Math.min(6, significant - 1 - Math.floor(Math.log10(a))));
  return v.toFixed(digits);
}

export const MRAD_PER_DEG = (Math.PI / 180) * 1000;

export function formatDeg(deg: number, significant = 3): string {
  return Number.isFinite(deg) ? `${formatNumber(deg, significant)}°` : "—";
}

export function formatMrad(deg: number, significant = 3): string {
  return Number.isFinite(deg) ? `${formatNumber(deg * MRAD_PER_DEG, significant)} mrad` : "—";
}

export function formatPct(pct: number, significant = 3): string {
  return Number.isFinite(pct) ? `${formatNumber(pct, significant)} %` : "—";
}

export type MetricUnit = "deg" | "%";

/** A value in its unit as one string: "0.512° (8.94 mrad)", "1.83 %". */
export function formatValue(v: number, unit: MetricUnit, significant = 3): string {
  if (unit === "%") return formatPct(v, significant);
  return `${formatDeg(v, significant)} (${formatMrad(v, significant)})`;
}

/** The unit as a short axis label. */
export const unitLabel = (unit: MetricUnit) => (unit === "%" ? "%" : "deg");

/** Decimals of a yield in % so the fraction out shows two significant figures (at least two). */
function yieldDecimals(y: number): number {
  const out = 1 - y;
  return out <= 0 ? 2 : Math.min(6, Math.max(2, Math.ceil(-Math.log10(out * 100)) + 1));
}

/**
 * A yield fraction as a percentage: 0.99275 → "99.28 %"; 0.999912 → "99.9912 %". Enough
 * decimals that the fraction out shows with two significant figures, at least two.
 */
export function formatYield(y: number, decimals = yieldDecimals(y)): string {
  if (!Number.isFinite(y)) return "—";
  return `${(y * 100).toFixed(decimals)} %`;
}

/** An interval of yields, both ends with the same decimals: "99.876 – 99.905 %". */
export function formatYieldRange(lo: number, hi: number): string {
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) return "—";
  const d = Math.max(yieldDecimals(lo), yieldDecimals(hi));
  return `${(lo * 100).toFixed(d)} – ${(hi * 100).toFixed(d)} %`;
}

/** Parts per million out: "7,250 ppm"; under 10 with one decimal. */
export function formatPpm(ppm: number): string {
  if (!Number.isFinite(ppm)) return "—";
  const v = Math.max(0, ppm);
  return `${v < 10 && v > 0 ? v.toFixed(1) : grouped.format(v)} ppm`;
}

/** Seconds as "< 1 s", "42 s", "3 min 05 s", "1 h 12 min". */
export function formatDuration(seconds: number | null | undefined): string {
  if (seconds === null || seconds === undefined || !Number.isFinite(seconds) || seconds < 0) return "—";
  if (seconds < 1) return "< 1 s";
  const s = Math.round(seconds);
  if (s < 60) return `${s} s`;
  const m = Math.floor(s / 60);
  if (m < 60) return `${m} min ${String(s % 60).padStart(2, "0")} s`;
  const h = Math.floor(m / 60);
  return `${h} h ${String(m % 60).padStart(2, "0")} min`;
}

/** Trials per second as "11,980 trials/s". */
export function formatRate(rate: number | null | undefined): string {
  return rate && Number.isFinite(rate) && rate > 0 ? `${formatCount(rate)} trials/s` : "—";
}
