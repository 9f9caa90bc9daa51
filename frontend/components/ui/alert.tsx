import type { ReactNode } from "react";
import { cn } from "@frontend/lib/cn";
import { AlertIcon } from "./icons";

/** A form-level or page-level message; `tone="error"` is announced at once. */
export function Alert({
  tone = "error",
  title,
  children,
  className,
}: {
  tone?: "error" | "info";
  title?: ReactNode;
  children?: ReactNode;
  className?: string;
}) {
  return (
    <div
      role={tone === "error" ? "alert" : "status"}
      className={cn(
        "flex gap-2.5 rounded-md border px-3 py-2.5 text-[13px]",
        tone === "error" ? "border-fail/30 bg-fail/[0.06] text-fail" : "border-gyro/25 bg-gyro/[0.05] text-ink",
        className,
      )}
    >
      <AlertIcon className="mt-0.5 shrink-0" />
      <div className="min-w-0">
        {title ? <p className="font-semibold">{title}</p> : null}
        {children ? <div className={cn(title ? "mt-0.5" : "", tone === "error" ? "text-fail/90" : "text-ink/75")}>{children}</div> : null}
      </div>
    </div>
  );
}
