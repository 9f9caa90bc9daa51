import { useEffect, useState } from "react";
import { Button } from "./button";
import { CheckIcon, CopyIcon } from "./icons";

/** Copies `value`; falls back to selecting a hidden field where the Clipboard API is refused. */
export function CopyButton({ value, label = "Copy link" }: { value: string; label?: string }) {
  const [copied, setCopied] = useState(false);

  useEffect(() => {
    if (!copied) return;
    const t = window.setTimeout(() => setCopied(false), 1800);
    return () => window.clearTimeout(t);
  }, [copied]);

  async function copy() {
    try {
      await navigator.clipboard.writeText(value);
    } catch {
      const area = document.createElement("textarea");
      area.value = value;
      area.setAttribute("readonly", "");
      area.style.position = "fixed";
      area.style.opacity = "0";
      document.body.appendChild(area);
      area.select();
      document.execCommand("copy");
      area.remove();
    }
    setCopied(true);
  }

  return (
    <Button size="sm" variant="secondary" onClick={copy} icon={copied ? <CheckIcon className="text-pass" /> : <CopyIcon />}>
      {copied ? "Copied" : label}
    </Button>
  );
}
