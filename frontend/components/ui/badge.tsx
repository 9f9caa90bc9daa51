import type { ReactNode } from "react";
import { cn } from "@frontend/lib/cn";

export type BadgeTone = "neutral" | "gyro" | "accel" | "mag" | "asic" | "substrate" | "board" | "pass" | "fail";

const TONES: Record<BadgeTone, string> = {
  neutral: "border-line bg-paper text-ink/70",
  gyro: "border-gyro/25 bg-gyro/[0.07] text-gyro",
  accel: "border-accel/25 bg-accel/[0.07] text-accel",
  mag: "border-mag/30 bg-mag/[0.08] text-[#b23f1d]",
  asic: "border-asic/30 bg-asic/[0.08] text-asic",
  substrate: "border-substrate/30 bg-substrate/[0.1] text-[#5b6839]",
  board: "border-board/25 bg-board/[0.08] text-board",
  pass: "border-pass/25 bg-pass/[0.08] text-pass",
  fail: "border-fail/25 bg-fail/[0.07] text-fail",
};

export function Badge({
  tone = "neutral",
  dot = false,
  children,
  className,
}: {
  tone?: BadgeTone;
  dot?: boolean;
  children: ReactNode;
  className?: string;
}) {
  return (
    <span
      className={cn(
        "inline-flex h-5 items-center gap-1.5 rounded border px-1.5 text-2xs font-bold tracking-[0.02em] whitespace-nowrap",
        TONES[tone],
        className,
      )}
    >
      {dot ? <span className="size-1.5 rounded-full bg-current" aria-hidden="true" /> : null}
      {children}
    </span>
  );
}
