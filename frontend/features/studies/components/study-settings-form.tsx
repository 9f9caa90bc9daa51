import { useEffect, useMemo, useState, type FormEvent } from "react";
import { Link } from "react-router";
import type { RevisionSummary } from "@shared/schemas/revisions";
import type { StackFile } from "@shared/schemas/stack-file";
import type { StudySummary } from "@shared/schemas/studies";
import { WMM_FIRST_DATE, WMM_LAST_DATE } from "@shared/schemas/site";
import { Alert } from "@frontend/components/ui/alert";
import { Badge } from "@frontend/components/ui/badge";
import { Button } from "@frontend/components/ui/button";
import { Field, Input, Select } from "@frontend/components/ui/field";
import { PlusIcon, TrashIcon } from "@frontend/components/ui/icons";
import { Panel } from "@frontend/components/ui/panel";
import { Spinner } from "@frontend/components/ui/spinner";
import { Table, THead, Td, Th, Tr } from "@frontend/components/ui/table";
import { isApiError } from "@frontend/lib/api-client";
import { cn } from "@frontend/lib/cn";
import { useCreateStudy } from "../api/create-study";
import { useGeomagneticField } from "../api/get-geomagnetic-field";
import { useRevision } from "../api/get-revision";
import { formatCount, formatDeg, formatDuration, formatMrad, formatNumber, formatPct, formatYield, MRAD_PER_DEG } from "../lib/format";
import { metricLabel } from "../lib/metrics";
import { estimateSeconds } from "../lib/progress";
import {
  attitudeCount,
  buildStudy,
  DEFAULT_TILTS,
  issuesToErrors,
  randomSeed,
  siteOf,
  type FormErrors,
  type StudyFormValues,
} from "../lib/study-form";
import { SegmentedControl } from "./segmented-control";

const REVISION_STATUS: Record<string, string> = { draft: "draft", in_review: "in review", approved: "approved" };

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
  history,
  onStarted,
}: {
  revisions: RevisionSummary[];
  initialRevisionId: string;
  initialValues: StudyFormValues;
  /** "Study 3", when the settings were copied */
  startedFrom?: string;
  /** where "Start from the defaults" leads, when the settings were copied */
  defaultsHref?: string;
  /** the project's studies, for the time estimate */
  history: StudySummary[];
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
  const estimate = useMemo(
    () => estimateSeconds(trials, history.filter((s) => s.status === "finished").map((s) => s.progress.trialsPerSecond)),
    [trials, history],
  );

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

  const residualMrad = Number(v.residualTol) * MRAD_PER_DEG;
  const requirements = revision.data?.requirements ?? [];
  const currentRevision = revisions.find((r) => r.id === revisionId);

  return (
    <form onSubmit={submit} noValidate aria-label="Study settings" className="grid gap-4 lg:grid-cols-[minmax(0,1fr)_300px]">
      <div className="flex min-w-0 flex-col gap-4">
        {startedFrom ? (
          <p className="flex flex-wrap items-baseline justify-between gap-x-4 gap-y-1 rounded-md border border-gyro/25 bg-gyro/[0.05] px-3 py-2 text-xs text-ink/75">
            <span>
              Settings copied from <span className="font-semibold text-ink">{startedFrom}</span>, seed included: with the same seed, differences
              between the two come from the changes, not from sampling.
            </span>
            {defaultsHref ? (
              <Link to={defaultsHref} className="font-semibold whitespace-nowrap text-gyro hover:underline">
                Start from the defaults
              </Link>
            ) : null}
          </p>
        ) : null}
        <Panel title="Stack revision" accent="var(--color-asic)">
          <div className="grid gap-4 sm:grid-cols-[minmax(0,1fr)_minmax(0,1fr)]">
            <Field label="Revision" hint={currentRevision?.note || undefined}>
              {({ id, describedBy }) => (
                <Select id={id} aria-describedby={describedBy} compact value={revisionId} onChange={(e) => setRevisionId(e.target.value)}>
                  {revisions.map((r) => (
                    <option key={r.id} value={r.id}>
                      Revision {r.number} ({REVISION_STATUS[r.status] ?? r.status}): {r.name}
                    </option>
                  ))}
                </Select>
              )}
            </Field>
            <Field label="Label" aside="optional" error={errors.label}>
              {({ id, describedBy, invalid }) => (
                <Input
                  id={id}
                  compact
                  aria-describedby={describedBy}
                  invalid={invalid}
                  value={v.label}
                  maxLength={120}
                  placeholder="e.g. Calibrated at board level"
                  onChange={(e) => set("label", e.target.value)}
                />
              )}
            </Field>
          </div>
          {currentRevision && currentRevision.status !== "approved" ? (
            <p className="mt-2 text-xs text-[#8a5a00]">
              This revision is a {REVISION_STATUS[currentRevision.status]}: a study on it is fine for exploring, but reports need an approved revision.
            </p>
          ) : null}
          <div className="mt-3">
            <p className="mb-1.5 text-xs font-semibold text-ink/80">Requirements of revision {currentRevision?.number ?? ""}</p>
            {revision.isPending ? (
              <p className="flex items-center gap-2 text-xs text-ink/55">
                <Spinner /> Loading the revision…
              </p>
            ) : requirements.length ? (
              <div className="overflow-hidden rounded-md border border-line/80">
                <Table aria-label="Requirements of the revision">
                  <THead>
                    <tr>
                      <Th>Metric</Th>
                      <Th align="right">Limit |value|</Th>
                      <Th align="right">Yield target</Th>
                      <Th align="right">Allowed out</Th>
                    </tr>
                  </THead>
                  <tbody>
                    {requirements.map((r) => {
                      const pct = r.metric.includes("Pct");
                      return (
                        <Tr key={r.metric}>
                          <Td className="h-8 text-xs">
                            <span className="font-semibold">{metricLabel(r.metric)}</span>
                            <span className="ml-2 font-mono text-2xs text-ink/45">{r.metric}</span>
                          </Td>
                          <Td numeric className="h-8 text-xs">
                            ≤ {pct ? formatPct(r.max) : `${formatDeg(r.max)} (${formatMrad(r.max)})`}
                          </Td>
                          <Td numeric className="h-8 text-xs">
                            {formatYield(r.yield)}
                          </Td>
                          <Td numeric className="h-8 text-xs text-ink/60">
                            {formatCount((1 - r.yield) * 1e6)} ppm
                          </Td>
                        </Tr>
                      );
                    })}
                  </tbody>
                </Table>
              </div>
            ) : (
              <p className="text-xs text-ink/55">This revision has no requirements: the study reports the metrics without a verdict.</p>
            )}
            {errors._form && !create.isError ? <p className="mt-2 text-xs font-medium text-fail">{errors._form}</p> : null}
          </div>
        </Panel>

        <Panel title="Sampling" accent="var(--color-gyro)">
          <div className="grid gap-4 sm:grid-cols-3">
            <Field label={v.adaptive ? "Trials, at most" : "Trials"} error={errors.trials} hint="Up to 10,000,000">
              {({ id, describedBy, invalid }) => (
                <Input id={id} compact inputMode="numeric" className="text-right tabular-nums" aria-describedby={describedBy} invalid={invalid} value={v.trials} onChange={(e) => set("trials", e.target.value)} />
              )}
            </Field>
            <Field label="Seed" error={errors.seed} hint="The same seed gives the same numbers">
              {({ id, describedBy, invalid }) => (
                <div className="flex gap-1.5">
                  <Input id={id} compact inputMode="numeric" className="text-right tabular-nums" aria-describedby={describedBy} invalid={invalid} value={v.seed} onChange={(e) => set("seed", e.target.value)} />
                  <Button size="sm" className="h-7.5" onClick={() => set("seed", String(randomSeed()))} title="Draw a new seed">
                    New
                  </Button>
                </div>
              )}
            </Field>
            <div className="flex flex-col gap-1">
              <span className="text-xs font-semibold text-ink/80">Sampling</span>
              <SegmentedControl
                label="Sampling"
                value={v.sampling}
                onChange={(s) => set("sampling", s)}
                options={[
                  { value: "random", label: "Random" },
                  { value: "lhs", label: "Latin hypercube" },
                ]}
                className="self-start"
              />
              <span className="text-xs text-ink/55">{v.sampling === "lhs" ? "Stratified: steadier percentiles per trial" : "Independent draws"}</span>
            </div>
          </div>
          <div className="mt-3 flex flex-wrap items-center gap-x-5 gap-y-2 border-t border-line/70 pt-3">
            <label className="flex items-center gap-2 text-xs font-semibold text-ink/80">
              <input type="checkbox" className="size-3.5 accent-[#4f46e5]" checked={v.adaptive} onChange={(e) => set("adaptive", e.target.checked)} />
              Stop when the results are stable
            </label>
            {v.adaptive ? (
              <label className="flex items-center gap-2 text-xs text-ink/70">
                significant digits
                <div className="w-16">
                  <Select compact aria-label="Significant digits" value={v.significantDigits} onChange={(e) => set("significantDigits", e.target.value as "1" | "2")}>
                    <option value="1">1</option>
                    <option value="2">2</option>
                  </Select>
                </div>
              </label>
            ) : null}
            <span className="text-xs text-ink/55">
              {v.adaptive
                ? "Runs in batches and stops once the tracked percentiles no longer move in those digits (JCGM 101:2008, 7.9); the trials above are the ceiling."
                : "Runs exactly the trials above."}
            </span>
            {errors.adaptive ? <span className="text-xs font-medium text-fail">{errors.adaptive}</span> : null}
          </div>
        </Panel>

        <Panel title="Magnetic field" meta="the dip sets how tilt errors turn into heading errors" accent="var(--color-mag)">
          <SegmentedControl
            label="Field inclination from"
            value={v.fieldFrom}
            onChange={(f) => set("fieldFrom", f)}
            options={[
              { value: "typed", label: "Type the inclination" },
              { value: "site", label: "From a site (WMM2025)" },
            ]}
          />
          {v.fieldFrom === "typed" ? (
            <div className="mt-3 grid gap-4 sm:grid-cols-3">
              <Field
                label="Inclination (dip)"
                aside="deg, positive down"
                error={errors.inclinationDeg}
                hint={Number.isFinite(Number(v.inclinationDeg)) && v.inclinationDeg.trim() ? `${formatMrad(Number(v.inclinationDeg), 4)}; tan I = ${formatNumber(Math.tan((Number(v.inclinationDeg) * Math.PI) / 180))}` : undefined}
              >
                {({ id, describedBy, invalid }) => (
                  <Input id={id} compact inputMode="decimal" className="text-right tabular-nums" aria-describedby={describedBy} invalid={invalid} value={v.inclinationDeg} onChange={(e) => set("inclinationDeg", e.target.value)} />
                )}
              </Field>
            </div>
          ) : (
            <div className="mt-3 grid gap-4 md:grid-cols-[minmax(0,1fr)_260px]">
              <div className="grid grid-cols-2 gap-3 sm:grid-cols-4">
                <Field label="Latitude" aside="deg N" error={errors.latitudeDeg}>
                  {({ id, describedBy, invalid }) => (
                    <Input id={id} compact inputMode="decimal" className="text-right tabular-nums" aria-describedby={describedBy} invalid={invalid} value={v.latitudeDeg} placeholder="47.27" onChange={(e) => set("latitudeDeg", e.target.value)} />
                  )}
                </Field>
                <Field label="Longitude" aside="deg E" error={errors.longitudeDeg}>
                  {({ id, describedBy, invalid }) => (
                    <Input id={id} compact inputMode="decimal" className="text-right tabular-nums" aria-describedby={describedBy} invalid={invalid} value={v.longitudeDeg} placeholder="11.39" onChange={(e) => set("longitudeDeg", e.target.value)} />
                  )}
                </Field>
                <Field label="Altitude" aside="km" error={errors.altitudeKm}>
                  {({ id, describedBy, invalid }) => (
                    <Input id={id} compact inputMode="decimal" className="text-right tabular-nums" aria-describedby={describedBy} invalid={invalid} value={v.altitudeKm} onChange={(e) => set("altitudeKm", e.target.value)} />
                  )}
                </Field>
                <Field label="Date" error={errors.date}>
                  {({ id, describedBy, invalid }) => (
                    <Input id={id} compact type="date" min={WMM_FIRST_DATE} max={WMM_LAST_DATE} aria-describedby={describedBy} invalid={invalid} value={v.date} onChange={(e) => set("date", e.target.value)} />
                  )}
                </Field>
              </div>
              <FieldFound state={site === null ? "incomplete" : field.isError ? "error" : field.isFetching && !field.data ? "loading" : field.data ? "found" : "loading"} data={field.data} error={field.error?.message} stale={field.isPlaceholderData} />
            </div>
          )}
        </Panel>

        <Panel title="Attitude sweep" meta="headings at each tilt, for the heading error" accent="var(--color-accel)">
          <div className="grid gap-4 md:grid-cols-[180px_minmax(0,440px)]">
            <div className="flex flex-col gap-3">
              <Field label="Heading step" aside="deg" error={errors.headingStepDeg} hint={attitudes ? `${formatCount(attitudes)} attitudes per trial` : undefined}>
                {({ id, describedBy, invalid }) => (
                  <Input id={id} compact inputMode="decimal" className="text-right tabular-nums" aria-describedby={describedBy} invalid={invalid} value={v.headingStepDeg} onChange={(e) => set("headingStepDeg", e.target.value)} />
                )}
              </Field>
              {sensors.accel.length > 1 || sensors.mag.length > 1 ? (
                <>
                  <Field label="Compass accelerometer" error={errors.headingAccel}>
                    {({ id }) => (
                      <Select id={id} compact value={v.headingAccel} onChange={(e) => set("headingAccel", e.target.value)}>
                        <option value="">First in the stack ({sensors.accel[0]})</option>
                        {sensors.accel.map((s) => (
                          <option key={s} value={s}>
                            {s}
                          </option>
                        ))}
                      </Select>
                    )}
                  </Field>
                  <Field label="Compass magnetometer" error={errors.headingMag}>
                    {({ id }) => (
                      <Select id={id} compact value={v.headingMag} onChange={(e) => set("headingMag", e.target.value)}>
                        <option value="">First in the stack ({sensors.mag[0]})</option>
                        {sensors.mag.map((s) => (
                          <option key={s} value={s}>
                            {s}
                          </option>
                        ))}
                      </Select>
                    )}
                  </Field>
                </>
              ) : null}
            </div>
            <div>
              <div className="mb-1.5 flex items-center justify-between gap-2">
                <span className="text-xs font-semibold text-ink/80">Tilts (pitch, roll)</span>
                <div className="flex gap-1.5">
                  <Button size="sm" variant="ghost" onClick={() => set("tilts", DEFAULT_TILTS.map((t) => ({ pitchDeg: String(t.pitchDeg), rollDeg: String(t.rollDeg) })))}>
                    Reset to the five defaults
                  </Button>
                  <Button size="sm" icon={<PlusIcon size={14} />} onClick={() => set("tilts", [...v.tilts, { pitchDeg: "0", rollDeg: "0" }])} disabled={v.tilts.length >= 200}>
                    Add tilt
                  </Button>
                </div>
              </div>
              <div className="overflow-hidden rounded-md border border-line/80">
                <table className="w-full border-collapse text-xs" aria-label="Tilts">
                  <thead className="border-b border-line bg-paper/70">
                    <tr>
                      <th className="h-7 w-10 px-2 text-right text-2xs font-bold text-ink/50">#</th>
                      <th className="h-7 px-2 text-right text-2xs font-bold tracking-[0.06em] text-ink/55 uppercase">Pitch, deg</th>
                      <th className="h-7 px-2 text-right text-2xs font-bold tracking-[0.06em] text-ink/55 uppercase">Roll, deg</th>
                      <th className="w-10" />
                    </tr>
                  </thead>
                  <tbody>
                    {v.tilts.map((t, i) => (
                      <tr key={i} className="border-b border-line/60 last:border-b-0">
                        <td className="px-2 text-right text-ink/45 tabular-nums">{i + 1}</td>
                        {(["pitchDeg", "rollDeg"] as const).map((k) => (
                          <td key={k} className="px-1.5 py-1">
                            <Input
                              compact
                              aria-label={`Tilt ${i + 1} ${k === "pitchDeg" ? "pitch" : "roll"}`}
                              inputMode="decimal"
                              className="text-right tabular-nums"
                              invalid={!!errors[`tilts.${i}.${k}`]}
                              title={errors[`tilts.${i}.${k}`]}
                              value={t[k]}
                              onChange={(e) => set("tilts", v.tilts.map((x, j) => (j === i ? { ...x, [k]: e.target.value } : x)))}
                            />
                          </td>
                        ))}
                        <td className="px-1 text-center">
                          <button
                            type="button"
                            aria-label={`Remove tilt ${i + 1}`}
                            disabled={v.tilts.length <= 1}
                            onClick={() => set("tilts", v.tilts.filter((_, j) => j !== i))}
                            className="inline-flex size-6 items-center justify-center rounded text-ink/45 hover:bg-fail/[0.08] hover:text-fail disabled:opacity-30"
                          >
                            <TrashIcon size={13} />
                          </button>
                        </td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </div>
              {errors.tilts || Object.keys(errors).find((k) => k.startsWith("tilts.")) ? (
                <p className="mt-1 text-xs font-medium text-fail" role="alert">
                  {errors.tilts ?? `Tilt ${Number(Object.keys(errors).find((k) => k.startsWith("tilts."))!.split(".")[1]) + 1}: ${errors[Object.keys(errors).find((k) => k.startsWith("tilts."))!]}`}
                </p>
              ) : null}
            </div>
          </div>
        </Panel>

        <Panel title="Calibration" meta="compensates the sensors as measured after a stage" accent="var(--color-substrate)">
          <div className="flex flex-col gap-3">
            <SegmentedControl
              className="self-start"
              label="Calibrate after"
              value={v.calibrationAfter}
              onChange={(c) => set("calibrationAfter", c)}
              options={[
                { value: "none", label: "No calibration" },
                { value: "package", label: "After package test" },
                { value: "board", label: "After board assembly" },
              ]}
            />
            {v.calibrationAfter === "none" ? (
              <p className="text-xs text-ink/55">Every deviation reaches the firmware uncorrected.</p>
            ) : (
              <div className="grid gap-4 sm:grid-cols-3">
                <Field label="Residual distribution">
                  {({ id }) => (
                    <Select id={id} compact value={v.residualDist} onChange={(e) => set("residualDist", e.target.value as StudyFormValues["residualDist"])}>
                      <option value="normal">Normal</option>
                      <option value="uniform">Uniform</option>
                      <option value="triangular">Triangular</option>
                    </Select>
                  )}
                </Field>
                <Field label="Residual ±" aside="deg, per axis" error={errors.residualTol} hint={Number.isFinite(residualMrad) ? `± ${formatNumber(residualMrad)} mrad` : undefined}>
                  {({ id, describedBy, invalid }) => (
                    <Input id={id} compact inputMode="decimal" className="text-right tabular-nums" aria-describedby={describedBy} invalid={invalid} value={v.residualTol} onChange={(e) => set("residualTol", e.target.value)} />
                  )}
                </Field>
                {v.residualDist === "normal" ? (
                  <Field label="± is" aside="σ" error={errors.residualSigmas} hint={`σ = ${formatNumber(Number(v.residualTol) / Number(v.residualSigmas || 3))}°`}>
                    {({ id, describedBy, invalid }) => (
                      <Input id={id} compact inputMode="decimal" className="text-right tabular-nums" aria-describedby={describedBy} invalid={invalid} value={v.residualSigmas} onChange={(e) => set("residualSigmas", e.target.value)} />
                    )}
                  </Field>
                ) : null}
                <p className="text-xs text-ink/55 sm:col-span-3">
                  Deviations up to the {v.calibrationAfter} stage are measured and removed, up to this residual; later stages (
                  {v.calibrationAfter === "package" ? "board assembly, product" : "product"}) still count in full.
                </p>
              </div>
            )}
            {errors.calibrationAfter ? <p className="text-xs font-medium text-fail">{errors.calibrationAfter}</p> : null}
          </div>
        </Panel>
      </div>

      <aside className="lg:sticky lg:top-0 lg:self-start">
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
              {v.fieldFrom === "site" ? (fieldInclination !== null ? formatDeg(fieldInclination, 5) : "from the site") : Number.isFinite(Number(v.inclinationDeg)) ? formatDeg(Number(v.inclinationDeg), 5) : "—"}
            </dd>
            <dt className="text-ink/55">Requirements</dt>
            <dd className="num">{requirements.length}</dd>
            <dt className="text-ink/55">Estimated time</dt>
            <dd className="num">{estimate !== null ? `about ${formatDuration(estimate)}` : "—"}</dd>
          </dl>
          <p className="mt-2 text-2xs text-ink/50">
            {estimate !== null ? "At the median pace of this project's finished studies; a finer sweep runs slower." : "The pace shows once the run starts."} Studies run one at a time; you can leave this page.
          </p>
          {errors._form && create.isError ? (
            <Alert className="mt-3">{errors._form}</Alert>
          ) : Object.keys(errors).length ? (
            <Alert className="mt-3">Some settings need a look: see the fields marked in red.</Alert>
          ) : null}
          <Button type="submit" variant="primary" className="mt-3 w-full" pending={create.isPending} disabled={!revision.data}>
            Start study
          </Button>
        </Panel>
      </aside>
    </form>
  );
}

function FieldFound({
  state,
  data,
  error,
  stale,
}: {
  state: "incomplete" | "loading" | "found" | "error";
  data?: { model: string; inclinationDeg: number; declinationDeg: number; totalIntensityNt: number; horizontalIntensityNt: number };
  error?: string;
  stale: boolean;
}) {
  return (
    <div aria-live="polite" aria-label="Field at the site" className={cn("rounded-md border px-3 py-2", state === "error" ? "border-fail/30 bg-fail/[0.05]" : "border-line bg-paper/70")}>
      <div className="mb-1 flex items-center justify-between">
        <span className="text-2xs font-bold tracking-[0.06em] text-ink/50 uppercase">Field found</span>
        {data ? <Badge tone="mag">{data.model}</Badge> : null}
      </div>
      {state === "incomplete" ? (
        <p className="text-xs text-ink/55">
          Enter latitude, longitude and a date between {WMM_FIRST_DATE} and {WMM_LAST_DATE}.
        </p>
      ) : state === "error" ? (
        <p className="text-xs text-fail">{error}</p>
      ) : state === "loading" || !data ? (
        <p className="flex items-center gap-2 text-xs text-ink/55">
          <Spinner /> Looking up the field…
        </p>
      ) : (
        <dl className={cn("grid grid-cols-[1fr_auto] gap-x-3 gap-y-0.5 text-xs", stale && "opacity-60")}>
          <dt className="text-ink/60">Inclination</dt>
          <dd className="num font-bold text-ink">
            <span>{formatDeg(data.inclinationDeg, 5)}</span> <span className="font-normal text-ink/50">({formatMrad(data.inclinationDeg, 4)})</span>
          </dd>
          <dt className="text-ink/60">Declination</dt>
          <dd className="num">{formatDeg(data.declinationDeg, 4)}</dd>
          <dt className="text-ink/60">Total intensity</dt>
          <dd className="num">{formatCount(data.totalIntensityNt)} nT</dd>
          <dt className="text-ink/60">Horizontal</dt>
          <dd className="num">{formatCount(data.horizontalIntensityNt)} nT</dd>
        </dl>
      )}
    </div>
  );
}
