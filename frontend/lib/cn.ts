import { clsx, type ClassValue } from "clsx";
import { twMerge } from "tailwind-merge";

/**
 * Joins class names, skipping falsy ones (clsx), and lets a later Tailwind class win over an
 * earlier one of the same kind (tailwind-merge): `cn("py-10", className)` with `className="py-4"`
 * gives `py-4`, whatever order the stylesheet has them in. Our one extra font size, `text-2xs`
 * (styles/app.css), is a t-shirt size tailwind-merge already reads as a size, not a colour.
 */
export function cn(...parts: ClassValue[]): string {
  return twMerge(clsx(parts));
}
