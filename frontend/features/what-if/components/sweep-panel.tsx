import { useMemo } from "react";
import { zodResolver } from "@hookform/resolvers/zod";
import { useForm } from "react-hook-form";
import * as z from "zod";
import { stackSources } from "@shared/datasets/sources";
import type { StackFile } from "@shared/schemas/stack-file";
import type { StudyFile } from "@shared/schemas/study-file";
import { CALIBRATION_RESIDUAL, INCLINATION } from "@shared/whatif/parameters";
import { formatCount, formatNumberUnit } from "@shared/format";
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { Field, Input, Select } from "@frontend/components/ui/field";
import { Panel } from "@frontend/components/ui/panel";
import { isApiError } from "@frontend/lib/api-client";
import { fieldProblemText, setServerErrors } from "@frontend/lib/form";
import { useCancelSweep, useCreateSweep, useSweep } from "../api/what-if";
import { defaultSourceValues, evenValues, TrialsTextSchema, ValuesTextSchema } from "../lib/values";
import { RunCancelled, RunProgress } from "./run-progress";
import { SweepChart } from "./sweep-chart";

export type ParameterOption = { id: string; label: string; unit: "um" | "deg"; current: number };

/** What a sweep may vary on this stack and study. */
export function parameterOptions(stack: StackFile, study: StudyFile): ParameterOption[] {
  const out: ParameterOption[] = stackSources(stack)
    .filter((s) => s.tolerance.dist !== "data" && (s.tolerance.tol ?? 0) > 0)
    .map((s) => ({ id: s.id, label: `${s.id} (±, ${s.unit === "um" ? "µm" : "°"})`, unit: s.unit, current: s.tolerance.tol! }));
  out.push({ id: INCLINATION, label: "Field inclination (°)", unit: "deg", current: study.inclinationDeg });
  const r = study.calibration?.residualDeg;
  if (study.calibration && study.calibration.after !== "none" && r && r.dist !== "data" && r.tol)
    out.push({ id: CALIBRATION_RESIDUAL, label: "Calibration residual (±, °)", unit: "deg", current: r.tol });
  return out;
}

function defaultValues(p: ParameterOption): number[] {
  return p.id === INCLINATION ? evenValues(0, 80, 9) : defaultSourceValues(p.current);
}

/** The sweep form as typed: the values one text, trials a whole number of at least 1,000. */
const SweepFormSchema = z.object({ parameter: z.string(), values: ValuesTextSchema, trials: TrialsTextSchema });

/** Sweep one parameter: the form, the run's progress, then one chart per requirement. */
export function SweepPanel({
  revisionId,
  stack,
  study,
  canRun,
  runId,
  onRun,
}: {
  revisionId: string;
  stack: StackFile;
  study: StudyFile;
  canRun: boolean;
  runId: string | null;
  onRun: (id: string) => void;
}) {
  const options = useMemo(() => parameterOptions(stack, study), [stack, study]);
  const first = options[0];
  const form = useForm({
    resolver: zodResolver(SweepFormSchema),
    defaultValues: {
      parameter: first?.id ?? INCLINATION,
      values: first ? defaultValues(first).join(", ") : "",
      trials: String(Math.min(study.trials, 20_000)),
    },
  });
  const { errors } = form.formState;
  const parameter = form.watch("parameter");
  const option = options.find((o) => o.id === parameter) ?? first;
  const create = useCreateSweep();
  const sweep = useSweep(runId);
  const cancel = useCancelSweep();

  const submit = form.handleSubmit(({ parameter, values, trials }) =>
    create.mutate(
      { revisionId, body: { study: { ...study, trials } as Record<string, unknown>, parameter, values } },
      { onSuccess: (r) => onRun(r.id), onError: (e) => setServerErrors(form, e) },
    ),
  );
  const fieldErrors = isApiError(create.error) ? create.error.fields : undefined;
  const s = sweep.data;

  return (
    <div className="flex flex-col gap-4">
      {canRun ? (
        <Panel title="Sweep a parameter" meta={`every point runs with seed ${study.seed}: the same trials, only the parameter differs`}>
          <form
            onSubmit={submit}
            className="grid gap-3 sm:grid-cols-[minmax(0,1fr)_minmax(0,2fr)] sm:items-end xl:grid-cols-[minmax(0,1.2fr)_minmax(0,2fr)_8rem_auto]"
          >
            <Field label="Parameter" hint={option ? `today ${formatNumberUnit(option.current, option.unit, 4)}` : undefined}>
              {({ id }) => (
                <Select
                  id={id}
                  {...form.register("parameter", {
                    onChange: (e: { target: { value: string } }) => {
                      // a new parameter starts from its own range
                      const o = options.find((x) => x.id === e.target.value);
                      if (o) form.setValue("values", defaultValues(o).join(", "));
                    },
                  })}
                >
                  {options.map((o) => (
                    <option key={o.id} value={o.id}>
                      {o.label}
                    </option>
                  ))}
                </Select>
              )}
            </Field>
            <Field label="Values" hint="up to 25, separated by commas" error={errors.values?.message}>
              {({ id, describedBy, invalid }) => (
                <Input id={id} invalid={invalid} aria-describedby={describedBy} {...form.register("values")} />
              )}
            </Field>
            <Field label="Trials per point" error={errors.trials?.message}>
              {({ id, describedBy, invalid }) => (
                <Input id={id} inputMode="numeric" invalid={invalid} aria-describedby={describedBy} {...form.register("trials")} />
              )}
            </Field>
            <Button type="submit" variant="primary" pending={create.isPending}>
              Run the sweep
            </Button>
          </form>
          {create.error ? (
            <Alert className="mt-3" title="The sweep was not started">
              {create.error.message} {fieldErrors?.map(fieldProblemText).join("; ")}
            </Alert>
          ) : null}
        </Panel>
      ) : null}

      {s ? (
        <Panel
          title={`Sweep of ${s.parameter}`}
          meta={`${s.values.length} points · ${formatCount(s.trials)} trials each · seed ${s.seed}`}
          accent="var(--color-gyro)"
        >
          {s.status === "queued" || s.status === "running" ? (
            <RunProgress
              label="Sweep"
              status={s.status}
              done={s.progress.done}
              total={s.progress.total}
              onCancel={canRun ? () => cancel.mutate(s.id) : undefined}
              cancelling={cancel.isPending}
            />
          ) : null}
          {s.status === "cancelled" ? <RunCancelled what="sweep" done={s.progress.done} total={s.progress.total} /> : null}
          {cancel.error ? (
            <Alert className="mt-3" title="The sweep was not cancelled">
              {cancel.error.message}
            </Alert>
          ) : null}
          {s.status === "failed" || s.status === "interrupted" ? (
            <Alert title="The sweep stopped">{s.error ?? "No message was recorded."}</Alert>
          ) : null}
          {s.status === "finished" ? (
            <p className="text-[13px] text-ink/65">
              All {s.points.length} points done; the marked point is today&apos;s value, whose yields equal an ordinary study with seed{" "}
              {s.seed}.
            </p>
          ) : null}
          <div className="mt-2 grid gap-5 lg:grid-cols-2">
            {(s.points[0]?.requirements ?? []).map((r, k) => (
              <SweepChart key={r.metric} sweep={s} k={k} parameterLabel={options.find((o) => o.id === s.parameter)?.label ?? s.parameter} />
            ))}
          </div>
        </Panel>
      ) : null}
    </div>
  );
}
