/**
 * Text <-> number for the editor's numeric fields. A field shows what the person typed
 * until it means a number; a comma is read as a decimal point, the typographic minus as
 * a minus, and an empty field means "not given" (the file's default, or a required value
 * the validator will ask for).
 */
export type ParsedNumber = { ok: true; value: number | undefined } | { ok: false };

export function parseNumberText(text: string): ParsedNumber {
  const t = text.trim().replace(/\u2212/g, "-").replace(",", ".");
  if (t === "") return { ok: true, value: undefined };
  if (!/^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i.test(t)) return { ok: false };
  const v = Number(t);
  return Number.isFinite(v) ? { ok: true, value: v } : { ok: false };
}

/** Twelve significant digits hide binary noise (0.1 + 0.2) without hiding real digits. */
export function numberText(value: number | undefined | null): string {
  if (value === undefined || value === null || !Number.isFinite(value)) return "";
  return String(Number(value.toPrecision(12)));
}

const group = (s: string) => s.replace(/\B(?=(\d{3})+(?!\d))/g, ",");

/** 3000 -> "3,000". */
export function formatCount(n: number): string {
  return group(String(Math.round(n)));
}

/** A figure for the estimate: three significant digits, at most four decimals. */
export function formatFigure(v: number): string {
  if (!Number.isFinite(v)) return "—";
  const a = Math.abs(v);
  if (a >= 100) return v.toFixed(0);
  if (a >= 10) return v.toFixed(1);
  if (a >= 1) return v.toFixed(2);
  if (a >= 0.01) return v.toFixed(3);
  if (a === 0) return "0";
  return v.toPrecision(2);
}

export function formatMrad(deg: number): string {
  return formatFigure((deg * Math.PI) / 180 * 1000);
}

/** A yield as a percentage with enough digits to tell 99.73 % from 99.9 %. */
export function formatYield(y: number): string {
  if (!Number.isFinite(y)) return "—";
  const pct = y * 100;
  if (pct >= 99.99 && pct < 100) return `${pct.toFixed(3)} %`;
  if (pct >= 99 && pct < 100) return `${pct.toFixed(2)} %`;
  return `${pct.toFixed(1)} %`;
}
