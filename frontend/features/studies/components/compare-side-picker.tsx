import type { StudySummary } from "@shared/schemas/studies";
import { Select } from "@frontend/components/ui/field";
import type { StudyDetail } from "../api/get-study";
import { StudyProgress } from "./study-progress";
import { StudyStatusBadge, VerdictBadge } from "./study-status-badge";

/** One side (A or B) of the comparison: which study, its verdict or progress. */
export function SidePicker({
  side,
  colour,
  studies,
  study,
  onPick,
  other,
}: {
  side: "a" | "b";
  colour: string;
  studies: StudySummary[];
  study: StudyDetail | null;
  onPick: (id: string | null) => void;
  other?: string;
}) {
  const label = side.toUpperCase();
  return (
    <section
      aria-label={`Study ${label}`}
      className="rounded-lg border border-line bg-panel px-4 py-3 shadow-[0_1px_2px_rgba(23,33,43,0.04)]"
    >
      <div className="flex items-center gap-3">
        <span
          className="flex size-6 shrink-0 items-center justify-center rounded text-xs font-extrabold text-white"
          style={{ background: colour }}
          aria-hidden="true"
        >
          {label}
        </span>
        <div className="min-w-0 flex-1">
          <Select compact aria-label={`Study ${label}`} value={study?.id ?? ""} onChange={(e) => onPick(e.target.value || null)}>
            <option value="">Choose a study…</option>
            {studies.map((s) => (
              <option key={s.id} value={s.id} disabled={s.id === other}>
                Study {s.number} · rev {s.revisionNumber} ·{" "}
                {s.status === "finished" ? (s.passes === null ? "finished" : s.passes ? "pass" : "fail") : s.status}
                {s.label ? ` · ${s.label}` : ""}
              </option>
            ))}
          </Select>
        </div>
        {study ? study.status === "finished" ? <VerdictBadge passes={study.passes} /> : <StudyStatusBadge status={study.status} /> : null}
      </div>
      {study && (study.status === "queued" || study.status === "running") ? (
        <div className="mt-3">
          <StudyProgress study={study} compact />
        </div>
      ) : null}
      {study && (study.status === "failed" || study.status === "cancelled" || study.status === "interrupted") ? (
        <p className="mt-2 text-xs text-ink/60">This study has no result ({study.status}). Open it to run it again.</p>
      ) : null}
    </section>
  );
}
