import { useEffect, useMemo, useRef, useState } from "react";
import { useForm, type FieldErrors, type Resolver } from "react-hook-form";
import { Link } from "react-router";
import type { RevisionSummary } from "@shared/schemas/revisions";
import type { StackFile } from "@shared/schemas/stack-file";
import type { CreateStudy, StudySummary } from "@shared/schemas/studies";
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

type StudyContext = { stack: StackFile | null; fieldInclination: number | null };

/**
 * The form's check: the study file it makes, checked with the shared study schema and against the revision's stack
 * (the stack and the site's inclination come as the form's context), each message under the field it names.
 */
const studyResolver: Resolver<StudyFormValues, StudyContext, CreateStudy> = (values, context) => {
  const built = buildStudy(values, context?.stack ?? null, context?.fieldInclination);
  if (built.ok) return { values: built.body, errors: {} };
  const errors: Record<string, unknown> = {};
  for (const [key, message] of Object.entries(built.errors)) {
    // "tilts.2.pitchDeg" nests as react-hook-form keeps it; "tilts" may hold a message and its rows' at once
    let at = errors;
    for (const part of key.split(".")) at = (at[part] ??= {}) as Record<string, unknown>;
    Object.assign(at, { type: "validate", message });
  }
  return { values: {}, errors: errors as FieldErrors<StudyFormValues> };
};

/** The messages by field name as the sections read them ("tilts.2.pitchDeg"); the server's form-level one is `_form`. */
function flatErrors(errors: unknown, prefix = "", out: FormErrors = {}): FormErrors {
  if (errors === null || typeof errors !== "object") return out;
  for (const [key, value] of Object.entries(errors)) {
    if (key === "ref" || key === "type" || key === "types") continue;
    if (key === "message" && typeof value === "string") out[prefix] ??= value;
    else if (prefix === "" && key === "root") flatErrors(value, "", out);
    else flatErrors(value, prefix === "" ? (key === "server" ? "_form" : key) : `${prefix}.${key}`, out);
  }
  return out;
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
  const revision = useRevision(revisionId);
  const stack = (revision.data?.stack ?? null) as StackFile | null;
  const create = useCreateStudy();

  // what the check needs beside the values: the revision's stack and the inclination shown for the site
  const context = useRef<StudyContext>({ stack: null, fieldInclination: null });
  const form = useForm<StudyFormValues, StudyContext, CreateStudy>({
    defaultValues: initialValues,
    resolver: (values, _context, options) => studyResolver(values, context.current, options),
  });
  const v = form.watch();
  const errors = flatErrors(form.formState.errors);

  // the sections are controlled inputs: a change is set on the form and clears that field's message
  const set = <K extends keyof StudyFormValues>(key: K, value: StudyFormValues[K]) => {
    form.setValue(key, value as never);
    form.clearErrors(key);
  };

  const site = useDebounced(siteOf(v), 300);
  const field = useGeomagneticField(site);
  const fieldInclination = v.fieldFrom === "site" && site && field.data ? Math.round(field.data.inclinationDeg * 1e4) / 1e4 : null;
  useEffect(() => {
    context.current = { stack, fieldInclination };
  }, [stack, fieldInclination]);

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

  const submit = form.handleSubmit((body) =>
    create.mutate(
      { revisionId, body },
      {
        onSuccess: onStarted,
        onError: (err) => {
          // the server names the study file's paths ("study.tilts[2].pitchDeg"): each message goes to the field it came from
          const issues = isApiError(err) && err.fields.length ? err.fields : [{ path: "", message: err.message }];
          for (const [key, message] of Object.entries(issuesToErrors(issues))) {
            if (key === "_form") form.setError("root.server", { type: "server", message });
            else form.setError(key as keyof StudyFormValues, { type: "server", message });
          }
        },
      },
    ),
  );

  const requirements = revision.data?.requirements ?? [];

  return (
    <form onSubmit={submit} noValidate aria-label="Study settings" className="grid gap-4 xl:grid-cols-[minmax(0,1fr)_300px]">
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

      <aside className="xl:sticky xl:top-0 xl:self-start">
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
