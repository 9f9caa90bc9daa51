import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { Panel } from "@frontend/components/ui/panel";
import type { FormErrors, StudyFormValues } from "../lib/study-form";
import { formatCount, formatDeg, formatDuration } from "@shared/format";
import type { StudyBudget } from "@shared/schemas/studies";
import { SettingsBudgetEditor } from "./settings-budget-editor";

/** The run's size, dip and estimated time beside the form, with the start button. */
export function SettingsRunPanel({
  v,
  errors,
  trials,
  attitudes,
  fieldInclination,
  requirementCount,
  estimate,
  work,
  budget,
  canSetBudget,
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
  /** trials × attitudes, the unit of the work budget */
  work: number | null;
  budget: StudyBudget | null;
  canSetBudget: boolean;
  /** the form-wide error came from the server */
  serverError: boolean;
  pending: boolean;
  ready: boolean;
}) {
  const over = !!budget && work !== null && work > budget.budget;
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
        <dt className="text-ink/55">Work budget</dt>
        <dd className={over ? "num font-semibold text-fail" : "num"}>{budget ? formatCount(budget.budget) : "—"}</dd>
        <dt className="text-ink/55">Estimated time</dt>
        <dd className="num">{estimate !== null ? `about ${formatDuration(estimate)}` : "—"}</dd>
      </dl>
      <p className="mt-2 text-2xs text-ink/50">
        {estimate !== null && budget?.workPerSecond
          ? `At ${formatCount(budget.workPerSecond)} compass evaluations per second, the median pace of this workspace's last ${budget.measuredStudies === 1 ? "finished study" : `${budget.measuredStudies} finished studies`} on this server; other studies running beside it slow it down.`
          : "No study has finished in this workspace yet: the time shows once one has, and the pace shows once the run starts."}{" "}
        Studies run one at a time; you can leave this page.
      </p>
      {over ? (
        <Alert className="mt-3">
          This study asks for {formatCount(work)} compass evaluations, more than the {formatCount(budget!.budget)} one study may use in this
          workspace: use fewer trials, a coarser heading step or fewer tilts
          {canSetBudget ? ", or raise the budget below" : ", or ask an admin to raise the budget"}.
        </Alert>
      ) : null}
      {canSetBudget && budget ? <SettingsBudgetEditor key={`${work}:${budget.budget}`} budget={budget} needed={work} /> : null}
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
