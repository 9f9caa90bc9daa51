import type { HTMLAttributes, ReactNode, TdHTMLAttributes, ThHTMLAttributes } from "react";
import { cn } from "@frontend/lib/cn";

export function TableFrame({ children, className }: { children: ReactNode; className?: string }) {
  return (
    <div className={cn("overflow-x-auto rounded-lg border border-line bg-panel shadow-[0_1px_2px_rgba(23,33,43,0.04)]", className)}>
      {children}
    </div>
  );
}

export function Table({ className, ...rest }: HTMLAttributes<HTMLTableElement>) {
  return <table className={cn("w-full border-collapse text-left text-[13px]", className)} {...rest} />;
}

export function THead({ className, ...rest }: HTMLAttributes<HTMLTableSectionElement>) {
  return <thead className={cn("border-b border-line bg-paper/70", className)} {...rest} />;
}

export function Th({ className, align = "left", ...rest }: ThHTMLAttributes<HTMLTableCellElement> & { align?: "left" | "right" }) {
  return (
    <th
      scope="col"
      className={cn(
        "h-8 px-3 text-2xs font-bold tracking-[0.06em] whitespace-nowrap text-ink/55 uppercase",
        align === "right" ? "text-right" : "text-left",
        className,
      )}
      {...rest}
    />
  );
}

export function Tr({ className, ...rest }: HTMLAttributes<HTMLTableRowElement>) {
  return <tr className={cn("border-b border-line/70 last:border-b-0 hover:bg-paper/60", className)} {...rest} />;
}

export function Td({ className, numeric = false, ...rest }: TdHTMLAttributes<HTMLTableCellElement> & { numeric?: boolean }) {
  return <td className={cn("h-10 px-3 align-middle", numeric && "num whitespace-nowrap", className)} {...rest} />;
}
