/**
 * The editor's compact controls: every numeric field carries its unit inside the box,
 * keeps what was typed until it is a number, and shows the validator's message below.
 */
import { useEffect, useId, useState, type InputHTMLAttributes, type ReactNode, type SelectHTMLAttributes } from "react";
import { cn } from "@frontend/lib/cn";
import { sentence } from "@frontend/lib/form";
import { numberText, parseNumberText } from "../lib/number-text";

const BOX =
  "block rounded-[5px] border bg-white text-ink placeholder:text-ink/35 transition-colors " +
  "focus:outline-none focus:ring-2 focus:ring-gyro/25 disabled:bg-paper/80 disabled:text-ink/60 disabled:cursor-default";
/** Full width unless the caller gives a width (two width utilities would fight). */
const width = (className?: string) => (/(^|\s)(w-|flex-1)/.test(className ?? "") ? "" : "w-full");
const boxState = (invalid: boolean) => (invalid ? "border-fail focus:border-fail" : "border-line hover:border-ink/30 focus:border-gyro");

export type NumberInputProps = {
  value: number | undefined;
  onChange: (value: number | undefined) => void;
  unit?: string;
  placeholder?: string;
  disabled?: boolean;
  invalid?: boolean;
  id?: string;
  "aria-label"?: string;
  "aria-describedby"?: string;
  className?: string;
  /** width of the unit slot; wide units ("µm", "mm") need a little more */
  size?: "sm" | "md";
  onLocalError?: (message: string | null) => void;
};

/** A number box with its unit. Text that is not (yet) a number is kept and not sent on. */
export function NumberInput({
  value,
  onChange,
  unit,
  placeholder,
  disabled,
  invalid = false,
  id,
  className,
  size = "md",
  onLocalError,
  ...aria
}: NumberInputProps) {
  const [text, setText] = useState(() => numberText(value));
  const [bad, setBad] = useState(false);

  // Undo, redo and edits elsewhere (the table, the form) change the value under the box.
  useEffect(() => {
    const p = parseNumberText(text);
    if (!p.ok || p.value !== value) {
      setText(numberText(value));
      setBad(false);
      onLocalError?.(null);
    }
    // only when the value changes from outside
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [value]);

  return (
    <NumberBox
      id={id}
      text={text}
      disabled={disabled}
      placeholder={placeholder}
      invalid={invalid || bad}
      unit={unit}
      size={size}
      className={className}
      {...aria}
      onText={(t) => {
        setText(t);
        const p = parseNumberText(t);
        setBad(!p.ok);
        onLocalError?.(p.ok ? null : "Enter a number");
        if (p.ok && p.value !== value) onChange(p.value);
      }}
      onBlur={() => {
        const p = parseNumberText(text);
        if (p.ok) setText(numberText(p.value));
      }}
    />
  );
}

/** The text box of a number with its unit inside: what NumberInput and the yield box draw. */
export function NumberBox({
  text,
  onText,
  onBlur,
  unit,
  placeholder,
  disabled,
  invalid,
  id,
  className,
  size = "md",
  ...aria
}: {
  text: string;
  onText: (text: string) => void;
  onBlur: () => void;
  unit?: string;
  placeholder?: string;
  disabled?: boolean;
  invalid: boolean;
  id?: string;
  className?: string;
  size?: "sm" | "md";
  "aria-label"?: string;
  "aria-describedby"?: string;
}) {
  return (
    <div className={cn("relative", className)}>
      <input
        id={id}
        type="text"
        inputMode="decimal"
        autoComplete="off"
        spellCheck={false}
        value={text}
        disabled={disabled}
        placeholder={placeholder}
        aria-invalid={invalid || undefined}
        {...aria}
        onChange={(e) => onText(e.target.value)}
        onBlur={onBlur}
        className={cn(BOX, "w-full", boxState(invalid), "num h-7 pl-2 text-xs", unit ? (size === "sm" ? "pr-6" : "pr-8") : "pr-2")}
      />
      {unit ? (
        <span
          className={cn(
            "pointer-events-none absolute inset-y-0 right-0 flex items-center text-[11px] font-semibold text-ink/45",
            size === "sm" ? "pr-1.5" : "pr-2",
          )}
          aria-hidden="true"
        >
          {unit}
        </span>
      ) : null}
    </div>
  );
}

type FieldShellProps = {
  label: ReactNode;
  error?: string;
  hint?: ReactNode;
  className?: string;
  children: (ids: {
    id: string;
    describedBy: string | undefined;
    invalid: boolean;
    setLocalError: (m: string | null) => void;
  }) => ReactNode;
};

/** Label above, control, then the first of: the local typing error, the validator's message, a hint. */
export function FieldShell({ label, error, hint, className, children }: FieldShellProps) {
  const id = useId();
  const [local, setLocal] = useState<string | null>(null);
  const message = local ?? error;
  const msgId = message ? `${id}-msg` : hint ? `${id}-hint` : undefined;
  return (
    <div className={cn("flex min-w-0 flex-col gap-0.5", className)}>
      <label htmlFor={id} className="truncate text-[11px] font-semibold text-ink/65">
        {label}
      </label>
      {children({ id, describedBy: msgId, invalid: !!message, setLocalError: setLocal })}
      {message ? (
        <p id={msgId} className="text-[11px] leading-4 font-medium text-fail">
          {sentence(message)}
        </p>
      ) : hint ? (
        <p id={msgId} className="text-[11px] leading-4 text-ink/50">
          {hint}
        </p>
      ) : null}
    </div>
  );
}

export function NumberField({
  label,
  error,
  hint,
  className,
  ...input
}: Omit<NumberInputProps, "id" | "invalid" | "onLocalError"> & { label: ReactNode; error?: string; hint?: ReactNode }) {
  return (
    <FieldShell label={label} error={error} hint={hint} className={className}>
      {({ id, describedBy, invalid, setLocalError }) => (
        <NumberInput id={id} aria-describedby={describedBy} invalid={invalid} onLocalError={setLocalError} {...input} />
      )}
    </FieldShell>
  );
}

export function TextInput({ invalid = false, className, ...rest }: InputHTMLAttributes<HTMLInputElement> & { invalid?: boolean }) {
  return (
    <input
      type="text"
      autoComplete="off"
      spellCheck={false}
      aria-invalid={invalid || undefined}
      className={cn(BOX, width(className), boxState(invalid), "h-7 px-2 text-xs", className)}
      {...rest}
    />
  );
}

export function SelectInput({
  invalid = false,
  className,
  children,
  ...rest
}: SelectHTMLAttributes<HTMLSelectElement> & { invalid?: boolean }) {
  return (
    <select
      aria-invalid={invalid || undefined}
      className={cn(
        BOX,
        width(className),
        boxState(invalid),
        "select-chevron h-7 min-w-max appearance-none pr-6 pl-2 text-xs field-sizing-content",
        className,
      )}
      {...rest}
    >
      {children}
    </select>
  );
}
