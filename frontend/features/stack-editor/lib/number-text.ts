/**
 * Text <-> number for the editor's numeric fields. A field shows what the person typed
 * until it means a number; a comma is read as a decimal point, the typographic minus as
 * a minus, and an empty field means "not given" (the file's default, or a required value
 * the validator will ask for).
 */
export type ParsedNumber = { ok: true; value: number | undefined } | { ok: false };

export function parseNumberText(text: string): ParsedNumber {
  const t = text
    .trim()
    .replace(/\u2212/g, "-")
    .replace(",", ".");
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
