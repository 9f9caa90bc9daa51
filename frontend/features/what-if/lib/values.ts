/** Sweep values as the form takes them: a list typed by hand, or evenly spaced from a range. */
import * as z from "zod";
import { MAX_SWEEP_VALUES } from "@shared/schemas/what-if";

/** "0.2, 0.4 0.6" → [0.2, 0.4, 0.6]; an error names the first entry that is not a number. */
export function parseValues(text: string): { values: number[] } | { error: string } {
  const parts = text
    .split(/[\s,;]+/)
    .map((p) => p.trim())
    .filter(Boolean);
  if (parts.length < 2) return { error: "give at least 2 values" };
  if (parts.length > MAX_SWEEP_VALUES) return { error: `at most ${MAX_SWEEP_VALUES} values` };
  const values: number[] = [];
  for (const p of parts) {
    const v = Number(p);
    if (!Number.isFinite(v)) return { error: `“${p}” is not a number` };
    values.push(v);
  }
  return { values };
}

/** n values from `from` to `to` inclusive, rounded to 4 significant digits. */
export function evenValues(from: number, to: number, n: number): number[] {
  const count = Math.max(2, Math.min(MAX_SWEEP_VALUES, Math.round(n)));
  return Array.from({ length: count }, (_, i) => Number((from + ((to - from) * i) / (count - 1)).toPrecision(4)));
}

/** A range around today's tolerance: a quarter of it to twice it, 9 values. */
export function defaultSourceValues(current: number): number[] {
  return evenValues(current / 4, current * 2, 9);
}

/** The values box of a form: its text checked and read as numbers. */
export const ValuesTextSchema = z.string().transform((text, ctx) => {
  const parsed = parseValues(text);
  if ("values" in parsed) return parsed.values;
  ctx.addIssue({ code: "custom", message: parsed.error });
  return z.NEVER;
});

/** Trials per run as typed in a what-if form: a whole number of at least 1,000. */
export const TrialsTextSchema = z.string().transform((text, ctx) => {
  const n = Number(text);
  if (Number.isInteger(n) && n >= 1000) return n;
  ctx.addIssue({ code: "custom", message: "trials must be a whole number of at least 1,000" });
  return z.NEVER;
});
