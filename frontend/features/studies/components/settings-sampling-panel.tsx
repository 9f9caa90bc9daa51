import { Button } from "@frontend/components/ui/button";
import { Field, Input, Select } from "@frontend/components/ui/field";
import { Panel } from "@frontend/components/ui/panel";
import { randomSeed } from "../lib/study-form";
import { SegmentedControl } from "./segmented-control";
import type { SettingsSectionProps } from "./settings-section-props";

/** Trials, seed, random or Latin hypercube sampling, and adaptive stopping. */
export function SettingsSamplingPanel({ v, set, errors }: SettingsSectionProps) {
  return (
    <Panel title="Sampling" accent="var(--color-gyro)">
      <div className="grid gap-4 sm:grid-cols-3">
        <Field label={v.adaptive ? "Trials, at most" : "Trials"} error={errors.trials} hint="Up to 10,000,000">
          {({ id, describedBy, invalid }) => (
            <Input
              id={id}
              compact
              inputMode="numeric"
              className="text-right tabular-nums"
              aria-describedby={describedBy}
              invalid={invalid}
              value={v.trials}
              onChange={(e) => set("trials", e.target.value)}
            />
          )}
        </Field>
        <Field label="Seed" error={errors.seed} hint="The same seed gives the same numbers">
          {({ id, describedBy, invalid }) => (
            <div className="flex gap-1.5">
              <Input
                id={id}
                compact
                inputMode="numeric"
                className="text-right tabular-nums"
                aria-describedby={describedBy}
                invalid={invalid}
                value={v.seed}
                onChange={(e) => set("seed", e.target.value)}
              />
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
          <span className="text-xs text-ink/55">
            {v.sampling === "lhs" ? "Stratified: steadier percentiles per trial" : "Independent draws"}
          </span>
        </div>
      </div>
      <div className="mt-3 flex flex-wrap items-center gap-x-5 gap-y-2 border-t border-line/70 pt-3">
        <label className="flex items-center gap-2 text-xs font-semibold text-ink/80">
          <input
            type="checkbox"
            className="size-3.5 accent-[#4f46e5]"
            checked={v.adaptive}
            onChange={(e) => set("adaptive", e.target.checked)}
          />
          Stop when the results are stable
        </label>
        {v.adaptive ? (
          <label className="flex items-center gap-2 text-xs text-ink/70">
            significant digits
            <div className="w-16">
              <Select
                compact
                aria-label="Significant digits"
                value={v.significantDigits}
                onChange={(e) => set("significantDigits", e.target.value as "1" | "2")}
              >
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
  );
}
