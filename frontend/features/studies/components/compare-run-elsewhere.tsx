import { useState } from "react";
import type { RevisionSummary } from "@shared/schemas/revisions";
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { Select } from "@frontend/components/ui/field";
import { isApiError } from "@frontend/lib/api-client";
import { fieldProblemText } from "@frontend/lib/form";
import { useCreateStudy } from "../api/create-study";
import type { StudyDetail } from "../api/get-study";

/** Runs study A's frozen settings on another revision, so only the stack differs. */
export function CompareRunElsewhere({
  source,
  revisions,
  onStarted,
}: {
  source: StudyDetail;
  revisions: RevisionSummary[];
  onStarted: (id: string) => void;
}) {
  const others = revisions.filter((r) => r.id !== source.revisionId);
  const [target, setTarget] = useState(others[0]?.id ?? "");
  const create = useCreateStudy();
  if (!others.length) return null;
  const rev = others.find((r) => r.id === target);
  return (
    <div className="flex flex-wrap items-center gap-x-3 gap-y-2 rounded-lg border border-line bg-paper/60 px-4 py-2.5">
      <p className="text-xs font-semibold text-ink/80">Same settings on another revision</p>
      <div className="max-w-full min-w-0">
        {/* as wide as the revision it shows (the row wraps first), never wider than the row */}
        <Select
          compact
          aria-label="Revision to run on"
          value={target}
          onChange={(e) => setTarget(e.target.value)}
          className="field-sizing-content w-auto max-w-full"
        >
          {others.map((r) => (
            <option key={r.id} value={r.id}>
              Revision {r.number} ({r.status.replace("_", " ")}): {r.name}
            </option>
          ))}
        </Select>
      </div>
      <Button
        size="sm"
        variant="primary"
        pending={create.isPending}
        disabled={!rev}
        onClick={() =>
          create.mutate(
            {
              revisionId: target,
              body: {
                // The frozen file, requirements and seed included, so only the stack differs.
                study: source.study,
                ...(source.site ? { site: source.site.site } : {}),
                label: `Settings of study ${source.number} on revision ${rev?.number ?? ""}`,
              },
            },
            { onSuccess: (s) => onStarted(s.id) },
          )
        }
      >
        Run these settings on revision {rev?.number ?? ""}
      </Button>
      <span className="text-2xs text-ink/50">Same seed and requirements as study {source.number}; opens here as study B.</span>
      {create.error ? (
        <Alert className="w-full">
          {create.error.message}
          {isApiError(create.error) && create.error.fields.length ? (
            <ul className="mt-1 list-disc pl-4">
              {create.error.fields.map((f) => (
                <li key={`${f.path}:${f.message}`}>{fieldProblemText(f)}</li>
              ))}
            </ul>
          ) : null}
        </Alert>
      ) : null}
    </div>
  );
}
