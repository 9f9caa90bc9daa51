import { cn } from "@frontend/lib/cn";

/** A row of mutually exclusive buttons (a radio group), for chart options. */
export function SegmentedControl<T extends string>({
  label,
  value,
  options,
  onChange,
  className,
}: {
  label: string;
  value: T;
  options: { value: T; label: string; title?: string }[];
  onChange: (value: T) => void;
  className?: string;
}) {
  return (
    <div role="radiogroup" aria-label={label} className={cn("inline-flex rounded-md border border-line bg-paper p-0.5", className)}>
      {options.map((o) => (
        <button
          key={o.value}
          type="button"
          role="radio"
          aria-checked={o.value === value}
          title={o.title}
          onClick={() => onChange(o.value)}
          className={cn(
            "h-6 rounded-[5px] px-2 text-2xs font-bold whitespace-nowrap tabular-nums transition-colors",
            o.value === value ? "bg-white text-ink shadow-[0_1px_2px_rgba(23,33,43,0.12)]" : "text-ink/55 hover:text-ink",
          )}
        >
          {o.label}
        </button>
      ))}
    </div>
  );
}
