import type { ButtonHTMLAttributes, ReactNode } from "react";
import { cn } from "@frontend/lib/cn";
import { Spinner } from "./spinner";

type Variant = "primary" | "secondary" | "ghost" | "danger" | "danger-ghost";
type Size = "sm" | "md" | "icon";

const VARIANTS: Record<Variant, string> = {
  primary: "bg-ink text-paper hover:bg-ink/90 border border-ink shadow-[0_1px_0_rgba(0,0,0,0.08)]",
  secondary: "bg-panel text-ink border border-line hover:border-ink/30 hover:bg-white shadow-[0_1px_0_rgba(23,33,43,0.04)]",
  ghost: "bg-transparent text-ink/75 border border-transparent hover:bg-ink/[0.06] hover:text-ink",
  danger: "bg-fail text-white border border-fail hover:bg-fail/90",
  "danger-ghost": "bg-transparent text-ink/60 border border-transparent hover:bg-fail/[0.08] hover:text-fail",
};
const SIZES: Record<Size, string> = {
  sm: "h-7 px-2.5 text-xs gap-1.5",
  md: "h-8.5 px-3.5 text-[13px] gap-2",
  icon: "size-7 text-xs",
};

export type ButtonProps = ButtonHTMLAttributes<HTMLButtonElement> & {
  variant?: Variant;
  size?: Size;
  pending?: boolean;
  icon?: ReactNode;
};

export function Button({
  variant = "secondary",
  size = "md",
  pending = false,
  icon,
  className,
  children,
  disabled,
  type = "button",
  ...rest
}: ButtonProps) {
  return (
    <button
      type={type}
      disabled={disabled || pending}
      aria-busy={pending || undefined}
      className={cn(
        "inline-flex shrink-0 items-center justify-center rounded-md font-semibold whitespace-nowrap transition-colors",
        "disabled:cursor-not-allowed disabled:opacity-55",
        VARIANTS[variant],
        SIZES[size],
        className,
      )}
      {...rest}
    >
      {pending ? <Spinner size={size === "md" ? 14 : 12} /> : icon}
      {children}
    </button>
  );
}

/** A square button holding only an icon; `label` is what a screen reader says. */
export function IconButton({
  label,
  children,
  className,
  variant = "ghost",
  ...rest
}: Omit<ButtonProps, "icon" | "size"> & { label: string }) {
  return (
    <Button aria-label={label} title={label} variant={variant} size="icon" className={className} {...rest}>
      {children}
    </Button>
  );
}
