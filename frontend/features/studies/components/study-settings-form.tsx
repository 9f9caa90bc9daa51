import { useEffect, useMemo, useState, type FormEvent } from "react";
import { Link } from "react-router";
import type { RevisionSummary } from "@shared/schemas/revisions";
import type { StackFile } from "@shared/schemas/stack-file";
import type { StudySummary } from "@shared/schemas/studies";
import { isApiError } from "@frontend/lib/api-client";
import { useCreateStudy } from "../api/create-study";
import { useGeomagneticField } from "../api/get-geomagnetic-field";
import { useStudyBudget } from "../api/study-budget";
import { useRevision } from "../api/get-revision";
import { estimateSeconds } from "../lib/progress";
import { attitudeCount, buildStudy, issuesToErrors, siteOf, type FormErrors, type StudyFormValues } from "../lib/study-form";
import { SettingsAttitudePanel } from "./settings-attitude-panel";
import { SettingsCalibrationPanel } from "./settings-calibration-panel";
import { SettingsFieldPanel } from "./settings-field-panel";
import { SettingsRevisionPanel } from "./settings-revision-panel";
import { SettingsRunPanel } from "./settings-run-panel";
import { SettingsSamplingPanel } from "./settings-sampling-panel";

/** Waits until typing pauses before the value is used (the field lookup). */
function useDebounced<T>(value: T, ms: number): T {
  const [v, setV] = useState(value);
  useEffect(() => {
    const t = window.setTimeout(() => setV(value), ms);
    return () => window.clearTimeout(t);
  }, [value, ms]);
  return v;
}

/**
 * The settings of a new study on one stack revision. Everything is checked in the browser
 * with the shared study schema and against the revision's stack; the server checks again.
 */
export function StudySettingsForm({
  revisions,
  initialRevisionId,
  initialValues,
  startedFrom,
  defaultsHref,
  canSetBudget = false,
  onStarted,
}: {
  revisions: RevisionSummary[];
  initialRevisionId: string;
  initialValues: StudyFormValues;
  /** "Study 3", when the settings were copied */
  startedFrom?: string;
  /** where "Start from the defaults" leads, when the settings were copied */
  defaultsHref?: string;
  /** whether this person may raise the workspace's work budget (admins) */
  canSetBudget?: boolean;
  onStarted: (study: StudySummary) => void;
}) {
  const [revisionId, setRevisionId] = useState(initialRevisionId);
  const [v, setV] = useState<StudyFormValues>(initialValues);
  const [errors, setErrors] = useState<FormErrors>({});
  const revision = useRevision(revisionId);
  const stack = (revision.data?.stack ?? null) as StackFile | null;
  const create = useCreateStudy();

  const set = <K extends keyof StudyFormValues>(key: K, value: StudyFormValues[K]) => {
    setV((old) => ({ ...old, [key]: value }));
    if (errors[key as string]) setErrors(({ [key as string]: _, ...rest }) => rest);
  };

  const site = useDebounced(siteOf(v), 300);
  const field = useGeomagneticField(site);
  const fieldInclination = v.fieldFrom === "site" && site && field.data ? Math.round(field.data.inclinationDeg * 1e4) / 1e4 : null;

  const sensors = useMemo(() => {
    const els = (stack?.elements ?? []) as { id: string; kind: string }[];
    return { accel: els.filter((e) => e.kind === "accel").map((e) => e.id), mag: els.filter((e) => e.kind === "mag").map((e) => e.id) };
  }, [stack]);

  const attitudes = (() => {
    const step = Number(v.headingStepDeg);
    return step > 0 ? attitudeCount({ headingStepDeg: step, tilts: v.tilts.map(() => ({ pitchDeg: 0, rollDeg: 0 })) }) : null;
  })();
  const trials = Number(v.trials.replace(/[\s,_]/g, ""));
  const budget = useStudyBudget();
  const work = attitudes && trials > 0 ? attitudes * trials : null;
  const estimate = work !== null ? estimateSeconds(work, budget.data?.workPerSecond) : null;

  function submit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const built = buildStudy(v, stack, fieldInclination);
    if (!built.ok) {
      setErrors(built.errors);
      return;
    }
    setErrors({});
    create.mutate(
      { revisionId, body: built.body },
      {
        onSuccess: onStarted,
        onError: (err) => {
          if (isApiError(err) && err.fields.length) setErrors(issuesToErrors(err.fields));
          else setErrors({ _form: err.message });
        },
      },
    );
  }

  const requirements = revision.data?.requirements ?? [];

  return (
    <form onSubmit={submit} noValidate aria-label="Study settings" className="grid gap-4 lg:grid-cols-[minmax(0,1fr)_300px]">
      <div className="flex min-w-0 flex-col gap-4">
        {startedFrom ? (
          <p className="flex flex-wrap items-baseline justify-between gap-x-4 gap-y-1 rounded-md border border-gyro/25 bg-gyro/[0.05] px-3 py-2 text-xs text-ink/75">
            <span>
              Settings copied from <span className="font-semibold text-ink">{startedFrom}</span>, seed included: with the same seed,
              differences between the two come from the changes, not from sampling.
            </span>
            {defaultsHref ? (
              <Link to={defaultsHref} className="font-semibold whitespace-nowrap text-gyro hover:underline">
                Start from the defaults
              </Link>
            ) : null}
          </p>
        ) : null}
        <SettingsRevisionPanel
          v={v}
          set={set}
          errors={errors}
          revisions={revisions}
          revisionId={revisionId}
          onRevision={setRevisionId}
          loading={revision.isPending}
          requirements={requirements}
          showFormError={!create.isError}
        />
        <SettingsSamplingPanel v={v} set={set} errors={errors} />
        <SettingsFieldPanel v={v} set={set} errors={errors} site={site} field={field} />
        <SettingsAttitudePanel v={v} set={set} errors={errors} sensors={sensors} attitudes={attitudes} />
        <SettingsCalibrationPanel v={v} set={set} errors={errors} />
      </div>

      <aside className="lg:sticky lg:top-0 lg:self-start">
        <SettingsRunPanel
          v={v}
          errors={errors}
          trials={trials}
          attitudes={attitudes}
          fieldInclination={fieldInclination}
          requirementCount={requirements.length}
          estimate={estimate}
          work={work}
          budget={budget.data ?? null}
          canSetBudget={canSetBudget}
          serverError={create.isError}
          pending={create.isPending}
          ready={!!revision.data}
        />
      </aside>
    </form>
  );
}
