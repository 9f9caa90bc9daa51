/**
 * Every problem the validator (or the server) found, each naming where it is; a click
 * selects the element it belongs to.
 */
import { useState } from "react";
import { fieldLabel, pathLabel } from "@shared/field-labels";
import { cn } from "@frontend/lib/cn";
import { sentence } from "@frontend/lib/form";
import type { IssueIndex } from "../lib/issues";
import type { EditorDoc } from "../lib/stack-ops";

export function ProblemList({
  issues,
  doc,
  onSelect,
  saving,
}: {
  issues: IssueIndex;
  doc: EditorDoc;
  onSelect: (id: string) => void;
  saving: boolean;
}) {
  const [open, setOpen] = useState(true);
  // places in words ("bond-line thickness (µm)"), never the file's paths
  const items: { where: string; field: string; message: string; id?: string }[] = [
    ...issues.general.map((g) => ({ where: "Stack", field: g.path ? pathLabel(g.path, doc.stack) : "", message: g.message })),
    ...[...issues.elements.entries()].flatMap(([i, list]) =>
      list.map((x) => ({
        where: doc.stack.elements[i]?.id ?? `element ${i + 1}`,
        field: x.field ? fieldLabel(x.field) : "",
        message: x.message,
        id: doc.stack.elements[i]?.id,
      })),
    ),
    ...[...issues.requirements.entries()].flatMap(([i, list]) =>
      list.map((x) => ({
        where: `Requirement ${i + 1}`,
        field: x.field ? pathLabel(`requirements[${i}].${x.field}`).split(": ")[1] : "",
        message: x.message,
      })),
    ),
  ];
  return (
    <section aria-label="Problems" className="mb-3 rounded-lg border border-fail/30 bg-fail/[0.04]">
      <button
        type="button"
        onClick={() => setOpen((o) => !o)}
        aria-expanded={open}
        className="flex w-full items-center gap-2 px-4 py-2 text-left"
      >
        <span className="flex h-5 min-w-5 items-center justify-center rounded-full bg-fail px-1.5 text-[11px] font-bold text-white">
          {issues.count}
        </span>
        <span className="text-[13px] font-bold text-fail">
          {saving
            ? issues.count === 1
              ? "One problem: the draft is saved once it is fixed"
              : `${issues.count} problems: the draft is saved once they are fixed`
            : `${issues.count === 1 ? "One problem" : `${issues.count} problems`} in this revision`}
        </span>
        <span className="ml-auto text-[11px] font-semibold text-fail/80">{open ? "Hide" : "Show"}</span>
      </button>
      {open ? (
        <ul className="grid gap-0.5 border-t border-fail/20 px-4 py-2">
          {items.slice(0, 12).map((p, k) => (
            <li key={k} className="flex min-w-0 items-baseline gap-2 text-xs">
              {p.id ? (
                <button
                  type="button"
                  onClick={() => onSelect(p.id!)}
                  className="shrink-0 font-bold text-ink underline decoration-ink/30 underline-offset-2 hover:decoration-ink"
                >
                  {p.where}
                </button>
              ) : (
                <span className="shrink-0 font-bold text-ink">{p.where}</span>
              )}
              {p.field ? <span className={cn("shrink-0 text-[11px] text-ink/60")}>{p.field}</span> : null}
              <span className="min-w-0 text-fail">{sentence(p.message)}</span>
            </li>
          ))}
          {items.length > 12 ? <li className="text-xs text-ink/55">and {items.length - 12} more</li> : null}
        </ul>
      ) : null}
    </section>
  );
}
