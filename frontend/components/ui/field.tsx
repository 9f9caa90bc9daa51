import { useId, type InputHTMLAttributes, type ReactNode, type SelectHTMLAttributes, type TextareaHTMLAttributes } from "react";
import { cn } from "@frontend/lib/cn";
import { sentence } from "@frontend/lib/form";

const CONTROL =
  "block w-full rounded-md border bg-white px-2.5 text-ink placeholder:text-ink/40 " +
  "transition-colors focus:outline-none focus:ring-2 focus:ring-gyro/25 disabled:bg-paper disabled:text-ink/50";

function controlClass(invalid: boolean, extra?: string) {
  return cn(CONTROL, invalid ? "border-fail focus:border-fail" : "border-line hover:border-ink/30 focus:border-gyro", extra);
}

type FieldProps = {
  label: ReactNode;
  error?: string;
  hint?: ReactNode;
  /** Text at the right of the label, e.g. a unit or "optional". */
  aside?: ReactNode;
  className?: string;
  children: (ids: { id: string; describedBy: string | undefined; invalid: boolean }) => ReactNode;
};

/** Label, control, hint and error wired together for assistive technology. */
export function Field({ label, error, hint, aside, className, children }: FieldProps) {
  const id = useId();
  const errorId = error ? `${id}-error` : undefined;
  // the hint gives way to the error: only what is on screen describes the control
  const hintId = hint && !error ? `${id}-hint` : undefined;
  const describedBy = [errorId, hintId].filter(Boolean).join(" ") || undefined;
  return (
    <div className={cn("flex flex-col gap-1", className)}>
      <div className="flex items-baseline justify-between gap-2">
        <label htmlFor={id} className="text-xs font-semibold text-ink/80">
          {label}
        </label>
        {aside ? <span className="text-2xs text-ink/50">{aside}</span> : null}
      </div>
      {children({ id, describedBy, invalid: !!error })}
      {error ? (
        <p id={errorId} role="alert" className="text-xs font-medium text-fail">
          {sentence(error)}
        </p>
      ) : hint ? (
        <p id={hintId} className="text-xs text-ink/55">
          {hint}
        </p>
      ) : null}
    </div>
  );
}

// Height and text size come from `compact`, never from `className`, so the two never fight.
const heightClass = (compact: boolean) => (compact ? "h-7.5 text-xs" : "h-8.5 text-[13px]");

type InputProps = InputHTMLAttributes<HTMLInputElement> & { invalid?: boolean; compact?: boolean };
export function Input({ invalid = false, compact = false, className, ...rest }: InputProps) {
  return <input aria-invalid={invalid || undefined} className={controlClass(invalid, cn(heightClass(compact), className))} {...rest} />;
}

type TextareaProps = TextareaHTMLAttributes<HTMLTextAreaElement> & { invalid?: boolean };
export function Textarea({ invalid = false, className, ...rest }: TextareaProps) {
  return (
    <textarea
      aria-invalid={invalid || undefined}
      className={controlClass(invalid, cn("py-2 text-[13px] leading-5", className))}
      {...rest}
    />
  );
}

type SelectProps = SelectHTMLAttributes<HTMLSelectElement> & { invalid?: boolean; compact?: boolean };
export function Select({ invalid = false, compact = false, className, children, ...rest }: SelectProps) {
  return (
    <select
      aria-invalid={invalid || undefined}
      className={controlClass(invalid, cn(heightClass(compact), "select-chevron appearance-none pr-7", className))}
      {...rest}
    >
      {children}
    </select>
  );
}
