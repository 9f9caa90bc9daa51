import type * as z from "zod";
import type { StackChangeSchema } from "@shared/schemas/revisions";
import { cn } from "@frontend/lib/cn";
import { useRevisionDiff } from "../api/get-revision-diff";

type Change = z.infer<typeof StackChangeSchema>;

const KIND_WORDS: Record<Change["kind"], string> = { added: "added", removed: "removed", changed: "changed" };
const show = (v: Change["before"], unit: string | null) => (v === null ? "—" : unit && typeof v === "number" ? `${v} ${unit}` : String(v));

/** The change set of a revision against the one before it, as a reviewer reads it. */
export function RevisionChanges({ revisionId, updatedAt }: { revisionId: string; updatedAt: string }) {
  const diff = useRevisionDiff(revisionId, updatedAt);
  if (diff.isPending) return <p className="text-xs text-ink/55">Finding what changed…</p>;
  if (diff.isError) return <p className="text-xs text-fail">{diff.error.message}</p>;
  const { against, changes } = diff.data;
  if (!against) return <p className="text-xs text-ink/55">The project's first revision: nothing to compare with.</p>;
  return (
    <section aria-label="What changed" className="text-[13px]">
      <p className="mb-1.5 text-xs font-bold text-ink/70">
        What changed since revision {against.number}:{" "}
        {changes.length === 0 ? "nothing" : `${changes.length} change${changes.length === 1 ? "" : "s"}`}
      </p>
      {changes.length ? (
        <ul className="max-h-64 divide-y divide-line/70 overflow-y-auto rounded-md border border-line">
          {changes.map((c) => (
            <li key={c.path} className="flex flex-wrap items-baseline justify-between gap-x-3 px-2.5 py-1.5">
              <span className="font-semibold text-ink">{c.label}</span>
              <span className="text-xs text-ink/70 tabular-nums">
                <span
                  className={cn(
                    "mr-1.5 font-bold uppercase",
                    c.kind === "removed" ? "text-fail" : c.kind === "added" ? "text-pass" : "text-ink/50",
                  )}
                >
                  {KIND_WORDS[c.kind]}
                </span>
                {c.kind === "changed"
                  ? `${show(c.before, c.unit)} → ${show(c.after, c.unit)}`
                  : c.kind === "added"
                    ? show(c.after, c.unit)
                    : show(c.before, c.unit)}
              </span>
            </li>
          ))}
        </ul>
      ) : null}
    </section>
  );
}
