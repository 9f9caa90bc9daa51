/**
 * A yield target as a person types it: in %, so 99.73 means the fraction 0.9973 that the
 * requirement stores. A value that cannot be a yield is refused with the reason in those terms.
 */
import { parseNumberText } from "./number-text";

export type ParsedYield = { ok: true; value: number | undefined } | { ok: false; message: string };

export function parseYieldPercent(text: string): ParsedYield {
  const p = parseNumberText(text.replace(/%\s*$/, ""));
  if (!p.ok) return { ok: false, message: "Enter the yield in %, for example 99.73" };
  if (p.value === undefined) return { ok: true, value: undefined };
  const pct = p.value;
  if (pct >= 100) return { ok: false, message: "A yield target must be below 100 %: a yield of exactly 100 % cannot be shown by sampling" };
  if (pct <= 0) return { ok: false, message: "A yield target must be above 0 %" };
  if (pct < 1)
    return {
      ok: false,
      message: `The yield is typed in %: ${String(pct)} would mean ${String(pct)} % of units within the limit; type ${String(Number((pct * 100).toPrecision(10)))} for ${String(Number((pct * 100).toPrecision(10)))} %`,
    };
  return { ok: true, value: Number((pct / 100).toPrecision(12)) };
}

/** The stored fraction as the text of the box: 0.9973 → "99.73". */
export function yieldPercentText(fraction: number | undefined): string {
  if (fraction === undefined || !Number.isFinite(fraction)) return "";
  return String(Number((fraction * 100).toPrecision(12)));
}
