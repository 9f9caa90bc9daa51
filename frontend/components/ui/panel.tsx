import type { ReactNode } from "react";
import { cn } from "@frontend/lib/cn";

/** A titled block of a page: a white panel on paper, with actions at the right of the title. */
export function Panel({
  title,
  meta,
  actions,
  children,
  className,
  bodyClassName,
  accent,
  padded = true,
}: {
  title: ReactNode;
  meta?: ReactNode;
  actions?: ReactNode;
  children: ReactNode;
  className?: string;
  bodyClassName?: string;
  /** A palette colour shown as a short bar before the title. */
  accent?: string;
  /** The body's padding; off for a table that runs edge to edge. */
  padded?: boolean;
}) {
  return (
    <section className={cn("rounded-lg border border-line bg-panel shadow-[0_1px_2px_rgba(23,33,43,0.04)]", className)}>
      <header className="flex min-h-11 items-center justify-between gap-3 border-b border-line px-4 py-2">
        <div className="flex min-w-0 items-center gap-2.5">
          {accent ? <span className="h-3.5 w-1 rounded-full" style={{ background: accent }} aria-hidden="true" /> : null}
          <h2 className="text-[13px] font-bold text-ink">{title}</h2>
          {meta ? <span className="text-xs text-ink/50">{meta}</span> : null}
        </div>
        {actions ? <div className="flex items-center gap-1.5">{actions}</div> : null}
      </header>
      <div className={cn(padded && "p-4", bodyClassName)}>{children}</div>
    </section>
  );
}
