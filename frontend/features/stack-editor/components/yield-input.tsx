/** A yield target typed in % (99.73), stored as a fraction (0.9973); the reason below when it cannot be a yield. */
import { useEffect, useState } from "react";
import { cn } from "@frontend/lib/cn";
import { parseYieldPercent, yieldPercentText } from "../lib/yield-text";
import { NumberBox } from "./fields";

export function YieldInput({
  value,
  onChange,
  disabled,
  invalid = false,
  className,
  "aria-label": label,
}: {
  value: number | undefined;
  onChange: (fraction: number | undefined) => void;
  disabled?: boolean;
  invalid?: boolean;
  className?: string;
  "aria-label": string;
}) {
  const [text, setText] = useState(() => yieldPercentText(value));
  const [error, setError] = useState<string | null>(null);
  useEffect(() => {
    const p = parseYieldPercent(text);
    if (!p.ok || p.value !== value) {
      setText(yieldPercentText(value));
      setError(null);
    }
    // only when the value changes from outside (undo, another field)
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [value]);
  return (
    <div className={cn("min-w-0", className)}>
      <NumberBox
        aria-label={label}
        unit="%"
        text={text}
        disabled={disabled}
        invalid={invalid || !!error}
        onText={(t) => {
          setText(t);
          const p = parseYieldPercent(t);
          setError(p.ok ? null : p.message);
          if (p.ok && p.value !== value) onChange(p.value);
        }}
        onBlur={() => {
          const p = parseYieldPercent(text);
          if (p.ok) setText(yieldPercentText(p.value));
        }}
      />
      {error ? (
        <p role="alert" className="mt-0.5 text-[11px] leading-4 font-medium text-fail">
          {error}
        </p>
      ) : null}
    </div>
  );
}
