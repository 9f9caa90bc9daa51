import { Field, Input, Select } from "@frontend/components/ui/field";
import { Panel } from "@frontend/components/ui/panel";
import { TYPICAL_RESIDUAL, type StudyFormValues } from "../lib/study-form";
import { SegmentedControl } from "./segmented-control";
import type { SettingsSectionProps } from "./settings-section-props";
import { MRAD_PER_DEG, formatNumber, formatPlain } from "@shared/format";

/** Calibration after a stage and the residual it leaves. */
export function SettingsCalibrationPanel({ v, set, errors }: SettingsSectionProps) {
  const residualMrad = Number(v.residualTol) * MRAD_PER_DEG;
  return (
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
                <Select
                  id={id}
                  compact
                  value={v.residualDist}
                  onChange={(e) => set("residualDist", e.target.value as StudyFormValues["residualDist"])}
                >
                  <option value="normal">Normal</option>
                  <option value="uniform">Uniform</option>
                  <option value="triangular">Triangular</option>
                </Select>
              )}
            </Field>
            <Field
              label="Residual ±"
              aside="deg, per axis"
              error={errors.residualTol}
              hint={`${Number.isFinite(residualMrad) ? `± ${formatNumber(residualMrad)} mrad · ` : ""}typical ±${formatPlain(TYPICAL_RESIDUAL.tol)}° (${TYPICAL_RESIDUAL.basis})`}
            >
              {({ id, describedBy, invalid }) => (
                <Input
                  id={id}
                  compact
                  inputMode="decimal"
                  className="text-right tabular-nums"
                  aria-describedby={describedBy}
                  invalid={invalid}
                  value={v.residualTol}
                  onChange={(e) => set("residualTol", e.target.value)}
                />
              )}
            </Field>
            {v.residualDist === "normal" ? (
              <Field
                label="± is"
                aside="σ"
                error={errors.residualSigmas}
                hint={`σ = ${formatNumber(Number(v.residualTol) / Number(v.residualSigmas || 3))}°`}
              >
                {({ id, describedBy, invalid }) => (
                  <Input
                    id={id}
                    compact
                    inputMode="decimal"
                    className="text-right tabular-nums"
                    aria-describedby={describedBy}
                    invalid={invalid}
                    value={v.residualSigmas}
                    onChange={(e) => set("residualSigmas", e.target.value)}
                  />
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
  );
}
