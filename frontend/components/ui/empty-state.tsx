import type { ReactNode } from "react";
import { cn } from "@frontend/lib/cn";

export function EmptyState({
  icon,
  title,
  children,
  action,
  className,
}: {
  icon?: ReactNode;
  title: ReactNode;
  children?: ReactNode;
  action?: ReactNode;
  className?: string;
}) {
  return (
    // Vertical padding is py-10 unless the caller sets its own.
    <div className={cn("flex flex-col items-center px-6 text-center", className ?? "py-10")}>
      {icon ? (
        <div className="mb-3 flex size-10 items-center justify-center rounded-lg border border-line bg-paper text-ink/55">{icon}</div>
      ) : null}
      <p className="text-[13px] font-bold text-ink">{title}</p>
      {children ? <div className="mt-1 max-w-md text-[13px] text-ink/60">{children}</div> : null}
      {action ? <div className="mt-4">{action}</div> : null}
    </div>
  );
}
