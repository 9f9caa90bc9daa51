/** Pieces every part of the study comparison shares: the A/B marks, the change tones, signed numbers. */
import type { ChangeTone } from "../lib/compare";
import { SERIES_A, SERIES_B } from "./chart-theme";
import { formatNumber } from "@shared/format";

export const TONE_CLASS: Record<ChangeTone, string> = {
  better: "bg-pass/[0.09] text-pass font-semibold",
  worse: "bg-fail/[0.08] text-fail font-semibold",
  same: "text-ink/55",
};

export const signed = (v: number, digits = 3) => `${v > 0 ? "+" : v < 0 ? "−" : "±"}${formatNumber(Math.abs(v), digits)}`;

export function ABLabel({ side }: { side: "a" | "b" }) {
  return (
    <span
      className="mr-1 inline-flex size-4 items-center justify-center rounded-sm align-middle text-[9px] font-extrabold text-white"
      style={{ background: side === "a" ? SERIES_A : SERIES_B }}
      aria-hidden="true"
    >
      {side.toUpperCase()}
    </span>
  );
}
