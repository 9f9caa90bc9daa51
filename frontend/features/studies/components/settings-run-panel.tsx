import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { Panel } from "@frontend/components/ui/panel";
import type { FormErrors, StudyFormValues } from "../lib/study-form";
import { formatCount, formatDeg, formatDuration } from "@shared/format";

/** The run's size, dip and estimated time beside the form, with the start button. */
export function SettingsRunPanel({
  v,
  errors,
  trials,
  attitudes,
  fieldInclination,
  requirementCount,
  estimate,
  serverError,
  pending,
  ready,
}: {
  v: StudyFormValues;
  errors: FormErrors;
  trials: number;
  attitudes: number | null;
  fieldInclination: number | null;
  requirementCount: number;
  estimate: number | null;
  /** the form-wide error came from the server */
  serverError: boolean;
  pending: boolean;
  ready: boolean;
}) {
  return (
    <Panel title="Run" accent="var(--color-ink)">
      <dl className="grid grid-cols-[1fr_auto] gap-x-3 gap-y-1.5 text-xs">
        <dt className="text-ink/55">Trials</dt>
        <dd className="num font-semibold">{Number.isFinite(trials) && trials > 0 ? formatCount(trials) : "—"}</dd>
        <dt className="text-ink/55">Attitudes per trial</dt>
        <dd className="num">{attitudes ? formatCount(attitudes) : "—"}</dd>
        <dt className="text-ink/55">Compass evaluations</dt>
        <dd className="num">{attitudes && trials > 0 ? formatCount(attitudes * trials) : "—"}</dd>
        <dt className="text-ink/55">Field dip</dt>
        <dd className="num">
          {v.fieldFrom === "site"
            ? fieldInclination !== null
              ? formatDeg(fieldInclination, 5)
              : "from the site"
            : Number.isFinite(Number(v.inclinationDeg))
              ? formatDeg(Number(v.inclinationDeg), 5)
              : "—"}
        </dd>
        <dt className="text-ink/55">Requirements</dt>
        <dd className="num">{requirementCount}</dd>
        <dt className="text-ink/55">Estimated time</dt>
        <dd className="num">{estimate !== null ? `about ${formatDuration(estimate)}` : "—"}</dd>
      </dl>
      <p className="mt-2 text-2xs text-ink/50">
        {estimate !== null
          ? "At the median pace of this project's finished studies; a finer sweep runs slower."
          : "The pace shows once the run starts."}{" "}
        Studies run one at a time; you can leave this page.
      </p>
      {errors._form && serverError ? (
        <Alert className="mt-3">{errors._form}</Alert>
      ) : Object.keys(errors).length ? (
        <Alert className="mt-3">Some settings need a look: see the fields marked in red.</Alert>
      ) : null}
      <Button type="submit" variant="primary" className="mt-3 w-full" pending={pending} disabled={!ready}>
        Start study
      </Button>
    </Panel>
  );
}
