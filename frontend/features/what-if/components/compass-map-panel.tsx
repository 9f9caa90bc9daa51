import { useMemo, useState } from "react";
import { zodResolver } from "@hookform/resolvers/zod";
import { useForm } from "react-hook-form";
import * as z from "zod";
import type { StudyFile } from "@shared/schemas/study-file";
import { WMM_FIRST_DATE, WMM_LAST_DATE } from "@shared/schemas/site";
import { INCLINATION } from "@shared/whatif/parameters";
import { metricLabel } from "@shared/metrics";
import { formatCount, formatShare, formatYield } from "@shared/format";
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { Field, Input, Select } from "@frontend/components/ui/field";
import { Panel } from "@frontend/components/ui/panel";
import { useCancelSweep, useCreateSweep, useInclinationGrid, useSweep } from "../api/what-if";
import { failingBands, latitudeText, yieldGrid } from "../lib/map";
import { evenValues, TrialsTextSchema } from "../lib/values";
import { CompassMap } from "./compass-map";
import { RunCancelled, RunProgress } from "./run-progress";

const today = () => {
  const d = new Date().toISOString().slice(0, 10);
  return d < WMM_FIRST_DATE ? WMM_FIRST_DATE : d > WMM_LAST_DATE ? WMM_LAST_DATE : d;
};
const GRID_STEP = 4;

/** The date draws the map as it changes; the trials go with the run. */
const MapFormSchema = z.object({ date: z.string(), trials: TrialsTextSchema });

/** Where on Earth the heading requirement holds: an inclination sweep mapped through the WMM at a date. */
export function CompassMapPanel({
  revisionId,
  study,
  canRun,
  runId,
  onRun,
}: {
  revisionId: string;
  study: StudyFile;
  canRun: boolean;
  runId: string | null;
  onRun: (id: string) => void;
}) {
  const form = useForm({
    resolver: zodResolver(MapFormSchema),
    defaultValues: { date: today(), trials: String(Math.min(study.trials, 20_000)) },
  });
  const date = form.watch("date");
  const create = useCreateSweep();
  const sweep = useSweep(runId);
  const cancel = useCancelSweep();
  const s = sweep.data;
  // the map needs every point: a part of the sweep would leave whole regions out
  const finished = s?.status === "finished";
  const grid = useInclinationGrid(date, GRID_STEP, finished && s.points.length > 1);
  const requirements = s?.points[0]?.requirements ?? [];
  const headingFirst = Math.max(
    0,
    requirements.findIndex((r) => r.metric.startsWith("heading.")),
  );
  const [chosen, setChosen] = useState<number | null>(null);
  const k = chosen ?? headingFirst;
  const req = requirements[k];
  const yields = useMemo(
    () => (finished && grid.data && s && req ? yieldGrid(grid.data, s.points, k) : null),
    [finished, grid.data, s, req, k],
  );
  const bands = useMemo(() => (grid.data && yields && req ? failingBands(grid.data, yields, req.yield) : []), [grid.data, yields, req]);

  const submit = form.handleSubmit(({ trials }) =>
    create.mutate(
      {
        revisionId,
        body: { study: { ...study, trials } as Record<string, unknown>, parameter: INCLINATION, values: evenValues(-88, 88, 23) },
      },
      { onSuccess: (r) => onRun(r.id) },
    ),
  );

  return (
    <div className="flex flex-col gap-4">
      <Panel title="Where the compass holds" meta="an inclination sweep from −88° to +88°, mapped with the World Magnetic Model 2025">
        <form onSubmit={submit} className="flex flex-wrap items-end gap-3">
          <Field label="Date" hint={`WMM2025: ${WMM_FIRST_DATE} to ${WMM_LAST_DATE}`}>
            {({ id }) => (
              <Input
                id={id}
                type="date"
                min={WMM_FIRST_DATE}
                max={WMM_LAST_DATE}
                {...form.register("date", {
                  // a cleared date falls back to today's, within the model's years
                  onChange: (e: { target: { value: string } }) => {
                    if (!e.target.value) form.setValue("date", today());
                  },
                })}
              />
            )}
          </Field>
          {canRun ? (
            <>
              <Field label="Trials per point" error={form.formState.errors.trials?.message}>
                {({ id, describedBy, invalid }) => (
                  <Input id={id} inputMode="numeric" invalid={invalid} aria-describedby={describedBy} {...form.register("trials")} />
                )}
              </Field>
              <Button type="submit" variant="primary" pending={create.isPending}>
                Run the inclination sweep
              </Button>
            </>
          ) : null}
          {requirements.length > 1 ? (
            <Field label="Requirement">
              {({ id }) => (
                <Select id={id} value={String(k)} onChange={(e) => setChosen(Number(e.target.value))}>
                  {requirements.map((r, i) => (
                    <option key={r.metric} value={i}>
                      {metricLabel(r.metric)} ≤ {r.max}
                    </option>
                  ))}
                </Select>
              )}
            </Field>
          ) : null}
        </form>
        {create.error ? (
          <Alert className="mt-3" title="The sweep was not started">
            {create.error.message}
          </Alert>
        ) : null}
        {s && s.parameter !== INCLINATION ? (
          <Alert className="mt-3" tone="info" title="Not an inclination sweep">
            Run an inclination sweep to draw the map.
          </Alert>
        ) : null}
      </Panel>
      {s && s.parameter === INCLINATION ? (
        <Panel
          title={req ? `${metricLabel(req.metric)} ≤ ${req.max} at ${formatYield(req.yield)}` : "Inclination sweep"}
          meta={`${formatCount(s.trials)} trials per point · seed ${s.seed} · field of ${grid.data?.model ?? "WMM"} on ${date}`}
          accent="var(--color-mag)"
        >
          {s.status === "queued" || s.status === "running" ? (
            <RunProgress
              label="Inclination sweep"
              status={s.status}
              done={s.progress.done}
              total={s.progress.total}
              onCancel={canRun ? () => cancel.mutate(s.id) : undefined}
              cancelling={cancel.isPending}
            />
          ) : null}
          {s.status === "cancelled" ? <RunCancelled what="sweep" done={s.progress.done} total={s.progress.total} /> : null}
          {finished && grid.data && yields && req ? (
            <div className="grid gap-4 lg:grid-cols-[minmax(0,3fr)_minmax(14rem,1fr)]">
              <CompassMap grid={grid.data} yields={yields} edgeYields={yieldGrid(grid.data, s.points, k, true)} target={req.yield} />
              <div className="text-[13px]">
                <p className="mb-1 font-bold text-ink">Latitude bands that fail</p>
                {bands.length === 0 ? (
                  <p className="text-pass">None: the requirement holds everywhere the sweep reaches.</p>
                ) : (
                  <ul className="flex flex-col gap-1" aria-label="Failing latitude bands">
                    {bands.map((b) => (
                      <li key={b.fromDeg} className="tabular-nums">
                        <span className="font-semibold text-fail">
                          {latitudeText(b.fromDeg)} to {latitudeText(b.toDeg)}
                        </span>{" "}
                        <span className="text-ink/65">fails over {formatShare(b.failingShare)} of it</span>
                      </li>
                    ))}
                  </ul>
                )}
                <p className="mt-3 text-xs text-ink/55">
                  Colour: the predicted yield at each place's field inclination, interpolated between the sweep's points; dashed line: where
                  it meets the target.
                </p>
              </div>
            </div>
          ) : null}
        </Panel>
      ) : null}
    </div>
  );
}
