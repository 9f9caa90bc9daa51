/**
 * How Orthostack writes numbers and units, everywhere: the editor, the study screens, the
 * data set pages, the report page, the PDF, the spreadsheet and the e-mails. Angles in degrees
 * with milliradians beside them, cross-axis in %, yields as percentages with enough digits to
 * tell them from 100 %, shares down to "< 0.1 %", measured values with four figures.
 * Dates stay with their readers (local time in the client, UTC in the report files).
 */

// made on first use: ICU's number formatting takes ~9 ms to set up, and an engine thread that
// imports this module for its metric labels never formats a number
let groupedFormat: Intl.NumberFormat | undefined;
const grouped = {
  format: (v: number) => (groupedFormat ??= new Intl.NumberFormat("en-US", { maximumFractionDigits: 0 })).format(v),
};

const DASH = "—";

export const MRAD_PER_DEG = (Math.PI / 180) * 1000;

/** The unit words of the model: `um` for lengths, `deg` for angles, `%` for cross-axis. */
export type ValueUnit = "um" | "deg" | "%";

/** The unit as printed after a value. */
export const UNIT_SYMBOL = { um: "µm", mm: "mm", deg: "°", mrad: "mrad", arcmin: "arcmin", "%": "%" } as const;
export type UnitWord = keyof typeof UNIT_SYMBOL;

/** 200000 → "200,000" */
export function formatCount(n: number | null | undefined): string {
  return n !== null && n !== undefined && Number.isFinite(n) ? grouped.format(Math.round(n)) : DASH;
}

/**
 * Significant figures (three by default), at most six decimals, thousands grouped:
 * 0.07504 → "0.0750", 1.254 → "1.25", 1250.4 → "1,250".
 */
export function formatNumber(v: number | null | undefined, significant = 3): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return DASH;
  const a = Math.abs(v);
  if (a === 0) return "0";
  if (a >= 1000) return grouped.format(v);
  const digits = Math.max(0, Math.min(6, significant - 1 - Math.floor(Math.log10(a))));
  return v.toFixed(digits);
}

/** As the engineer wrote it, without floating-point tails: 0.30000000000000004 → "0.3". */
export function formatPlain(v: number): string {
  return String(Math.round(v * 1e6) / 1e6);
}

/**
 * A measured value: four significant figures without trailing zeros, an exponent only for
 * extreme sizes, and a true minus sign (−1.3).
 */
export function formatMeasure(v: number, digits = 4): string {
  if (!Number.isFinite(v)) return DASH;
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

/** Text for a unit word ("µm", "°"); an unknown word as it is; empty for none. */
export function unitText(unit: string | null | undefined): string {
  if (!unit) return "";
  return unit in UNIT_SYMBOL ? UNIT_SYMBOL[unit as UnitWord] : unit;
}

/** A number already written, with its unit: "12 µm", "0.3°" (degrees sit on the number). */
export function attachUnit(text: string, unit: string | null | undefined): string {
  const u = unitText(unit);
  if (!u || text === DASH) return text;
  return u === "°" ? `${text}°` : `${text} ${u}`;
}

/** A measured value with its unit: "10.38 µm", "0.4°". */
export function formatMeasureUnit(v: number, unit: string | null | undefined, digits = 4): string {
  return attachUnit(formatMeasure(v, digits), unit);
}

/** Three significant figures with the unit: "1.25 µm", "0.0750°". */
export function formatNumberUnit(v: number | null | undefined, unit: string | null | undefined, significant = 3): string {
  return attachUnit(formatNumber(v, significant), unit);
}

export function formatDeg(deg: number | null | undefined, significant = 3): string {
  return attachUnit(formatNumber(deg, significant), "deg");
}

export function formatMrad(deg: number | null | undefined, significant = 3): string {
  return deg !== null && deg !== undefined && Number.isFinite(deg) ? `${formatNumber(deg * MRAD_PER_DEG, significant)} mrad` : DASH;
}

/**
 * An axis tick of a signed quantity: "+0.25°", "−0.25°", "0°" (a true minus sign, and a plus
 * so the two sides of zero read apart at a glance).
 */
export function formatSignedTick(v: number, unit: "deg" | "%", significant = 3): string {
  if (!Number.isFinite(v)) return DASH;
  const sign = v > 0 ? "+" : v < 0 ? "−" : "";
  return `${sign}${attachUnit(formatNumber(Math.abs(v), significant), unit)}`;
}

/** A value already in percent (cross-axis): "1.83 %". */
export function formatPct(pct: number | null | undefined, significant = 3): string {
  return attachUnit(formatNumber(pct, significant), "%");
}

/** A value of a metric in its unit as one string: "0.512° (8.94 mrad)", "1.83 %". */
export function formatValue(v: number, unit: "deg" | "%", significant = 3): string {
  if (unit === "%") return formatPct(v, significant);
  return Number.isFinite(v) ? `${formatDeg(v, significant)} (${formatMrad(v, significant)})` : DASH;
}

/** A fraction as a percentage with fixed decimals: 0.4567 → "45.67 %". */
export function formatFraction(fraction: number | null | undefined, decimals = 2): string {
  return fraction !== null && fraction !== undefined && Number.isFinite(fraction) ? `${(fraction * 100).toFixed(decimals)} %` : DASH;
}

/**
 * A share of a whole (a contributor's part of a spread): "42 %", "3.5 %", and "< 0.1 %"
 * for what would print as zero, so a small contributor is not mistaken for none.
 */
export function formatShare(fraction: number | null | undefined): string {
  if (fraction === null || fraction === undefined || !Number.isFinite(fraction)) return DASH;
  if (fraction <= 0) return "0 %";
  if (fraction < 0.0005) return "< 0.1 %";
  return `${(fraction * 100).toFixed(fraction < 0.1 ? 1 : 0)} %`;
}

/** Decimals of a yield in % so the fraction out shows two significant figures (at least two). */
function yieldDecimals(y: number): number {
  const out = 1 - y;
  return out <= 0 ? 2 : Math.min(6, Math.max(2, Math.ceil(-Math.log10(out * 100)) + 1));
}

/**
 * A yield fraction as a percentage: 0.99275 → "99.28 %"; 0.999912 → "99.9912 %". Enough
 * decimals that the fraction out shows with two significant figures, at least two.
 */
export function formatYield(y: number | null | undefined, decimals?: number): string {
  if (y === null || y === undefined || !Number.isFinite(y)) return DASH;
  return `${(y * 100).toFixed(decimals ?? yieldDecimals(y))} %`;
}

/** An interval of yields, both ends with the same decimals: "99.876 – 99.905 %". */
export function formatYieldRange(lo: number, hi: number): string {
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) return DASH;
  const d = Math.max(yieldDecimals(lo), yieldDecimals(hi));
  return `${(lo * 100).toFixed(d)} – ${(hi * 100).toFixed(d)} %`;
}

/** Parts per million out: "7,250 ppm", two figures under 100 ("63 ppm", "2.5 ppm"), "< 0.01 ppm". */
export function formatPpm(ppm: number | null | undefined): string {
  if (ppm === null || ppm === undefined || !Number.isFinite(ppm)) return DASH;
  const v = Math.max(0, ppm);
  if (v === 0) return "0 ppm";
  if (v < 0.01) return "< 0.01 ppm";
  if (v < 100) return `${Number(v.toPrecision(2))} ppm`;
  return `${grouped.format(v)} ppm`;
}

/** A capability index (Cp, Cpk) with two decimals: "1.33". */
export function formatIndex(v: number | null | undefined): string {
  return v !== null && v !== undefined && Number.isFinite(v) ? v.toFixed(2) : DASH;
}

/** Seconds as "< 1 s", "42 s", "3 min 05 s", "1 h 12 min". */
export function formatDuration(seconds: number | null | undefined): string {
  if (seconds === null || seconds === undefined || !Number.isFinite(seconds) || seconds < 0) return DASH;
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
  return rate && Number.isFinite(rate) && rate > 0 ? `${formatCount(rate)} trials/s` : DASH;
}

/** A file size: "512 B", "3.4 kB", "1.2 MB". */
export function formatBytes(n: number): string {
  if (n < 1024) return `${n} B`;
  if (n < 1024 * 1024) return `${(n / 1024).toFixed(n < 10 * 1024 ? 1 : 0)} kB`;
  return `${(n / 1048576).toFixed(1)} MB`;
}

/** A value as the engineer wrote it, with its unit and an optional sign: "±12 µm", "+0.3°". */
export function formatWritten(v: number | null | undefined, unit: string | null | undefined, prefix = ""): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return DASH;
  return `${prefix}${attachUnit(formatPlain(v), unit)}`;
}

/**
 * A value rounded to a fixed step (a drawing's or a file's stated resolution), with a true
 * minus sign: (−0.3, 0.001) → "−0.300", (15, 0.1) → "15.0".
 */
export function formatFixed(v: number | null | undefined, step: number): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return DASH;
  const decimals = Math.max(0, Math.round(-Math.log10(step)));
  const s = roundTo(v, step).toFixed(decimals);
  return /^-0(\.0*)?$/.test(s) ? s.slice(1) : s.replace(/^-/, "−");
}

/** v rounded to a multiple of step, without floating-point tails (for files read by machines). */
export function roundTo(v: number, step: number): number {
  const decimals = Math.max(0, Math.round(-Math.log10(step)));
  const r = Number((Math.round(v / step) * step).toFixed(decimals));
  return Object.is(r, -0) ? 0 : r;
}
