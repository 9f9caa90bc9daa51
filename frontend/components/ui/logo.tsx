import { cn } from "@frontend/lib/cn";

/**
 * The mark is a stack seen from the side: board, ASIC, then the gyroscope and
 * accelerometer dies with the magnetometer on top, in their palette colours.
 */
export function LogoMark({ size = 28, className }: { size?: number; className?: string }) {
  return (
    <svg width={size} height={size} viewBox="0 0 32 32" className={className} aria-hidden="true" focusable="false">
      <rect x="3" y="24" width="26" height="4" rx="1" fill="var(--color-board)" />
      <rect x="6" y="19" width="20" height="4" rx="1" fill="var(--color-asic)" />
      <rect x="7.5" y="14" width="8" height="4" rx="1" fill="var(--color-gyro)" />
      <rect x="16.5" y="14" width="8" height="4" rx="1" fill="var(--color-accel)" />
      <rect x="11" y="9" width="10" height="4" rx="1" fill="var(--color-mag)" />
      <path d="M16 3.5v4" stroke="var(--color-mag)" strokeWidth="1.5" strokeLinecap="round" />
    </svg>
  );
}

export function Logo({ tone = "light", className }: { tone?: "light" | "dark"; className?: string }) {
  return (
    <span className={cn("inline-flex items-center gap-2.5", className)}>
      <LogoMark />
      <span className={cn("text-[15px] font-extrabold tracking-[-0.01em]", tone === "light" ? "text-paper" : "text-ink")}>Orthostack</span>
    </span>
  );
}
