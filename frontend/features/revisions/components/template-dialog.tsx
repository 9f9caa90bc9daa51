/**
 * "New stack from a template": the arrangements of `GET /api/stack-templates`, each with its
 * elements and requirements named, so the engineer starts from a stack with typical
 * tolerances in place and changes sizes and values.
 */
import { useState } from "react";
import type { StackTemplateEntry } from "@shared/schemas/stack-help";
import { Button } from "@frontend/components/ui/button";
import { Dialog } from "@frontend/components/ui/dialog";
import { Spinner } from "@frontend/components/ui/spinner";
import { cn } from "@frontend/lib/cn";
import { useStackTemplates } from "../api/get-stack-templates";

type Element = { id?: unknown; kind?: unknown };

export function TemplateDialog({
  open,
  onClose,
  onChoose,
  pending,
}: {
  open: boolean;
  onClose: () => void;
  onChoose: (template: StackTemplateEntry) => void;
  pending: boolean;
}) {
  const templates = useStackTemplates(open);
  const [chosen, setChosen] = useState<string | null>(null);
  const list = templates.data ?? [];
  const pick = list.find((t) => t.id === chosen) ?? list[0];
  return (
    <Dialog
      open={open}
      onClose={onClose}
      busy={pending}
      title="New stack from a template"
      description="Each starts with typical tolerances (common practice) and the usual requirements; change sizes and values to your parts."
      footer={
        <>
          <Button variant="ghost" onClick={onClose} disabled={pending}>
            Cancel
          </Button>
          <Button variant="primary" pending={pending} disabled={!pick} onClick={() => pick && onChoose(pick)}>
            Start from this template
          </Button>
        </>
      }
    >
      {templates.isPending ? (
        <p className="flex items-center gap-2 text-[13px] text-ink/60">
          <Spinner /> Loading templates…
        </p>
      ) : templates.isError ? (
        <p className="text-[13px] text-fail">{templates.error.message}</p>
      ) : (
        <div role="radiogroup" aria-label="Templates" className="grid gap-2">
          {list.map((t) => {
            const elements = (Array.isArray(t.stack.elements) ? t.stack.elements : []) as Element[];
            const on = pick?.id === t.id;
            return (
              <button
                key={t.id}
                type="button"
                role="radio"
                aria-checked={on}
                onClick={() => setChosen(t.id)}
                className={cn(
                  "rounded-md border px-3 py-2 text-left transition-colors",
                  on ? "border-gyro bg-gyro/[0.05]" : "border-line hover:bg-paper",
                )}
              >
                <span className="block text-[13px] font-bold text-ink">{t.name}</span>
                <span className="mt-0.5 block text-xs text-ink/65">{t.description}</span>
                <span className="mt-1 block text-[11px] text-ink/50">
                  {elements.length} elements · {t.requirements.length} requirements
                </span>
              </button>
            );
          })}
        </div>
      )}
    </Dialog>
  );
}
