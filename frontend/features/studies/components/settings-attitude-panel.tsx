import { Button } from "@frontend/components/ui/button";
import { Field, Input, Select } from "@frontend/components/ui/field";
import { PlusIcon, TrashIcon } from "@frontend/components/ui/icons";
import { Panel } from "@frontend/components/ui/panel";
import { DEFAULT_TILTS } from "../lib/study-form";
import type { SettingsSectionProps } from "./settings-section-props";
import { formatCount } from "@shared/format";

/** The heading step, the compass's sensors (when the stack has several) and the table of tilts. */
export function SettingsAttitudePanel({
  v,
  set,
  errors,
  sensors,
  attitudes,
}: SettingsSectionProps & { sensors: { accel: string[]; mag: string[] }; attitudes: number | null }) {
  return (
    <Panel title="Attitude sweep" meta="headings at each tilt, for the heading error" accent="var(--color-accel)">
      <div className="grid gap-4 md:grid-cols-[180px_minmax(0,440px)]">
        <div className="flex flex-col gap-3">
          <Field
            label="Heading step"
            aside="deg"
            error={errors.headingStepDeg}
            hint={attitudes ? `${formatCount(attitudes)} attitudes per trial` : undefined}
          >
            {({ id, describedBy, invalid }) => (
              <Input
                id={id}
                compact
                inputMode="decimal"
                className="text-right tabular-nums"
                aria-describedby={describedBy}
                invalid={invalid}
                value={v.headingStepDeg}
                onChange={(e) => set("headingStepDeg", e.target.value)}
              />
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
              <Button
                size="sm"
                variant="ghost"
                onClick={() =>
                  set(
                    "tilts",
                    DEFAULT_TILTS.map((t) => ({ pitchDeg: String(t.pitchDeg), rollDeg: String(t.rollDeg) })),
                  )
                }
              >
                Reset to the five defaults
              </Button>
              <Button
                size="sm"
                icon={<PlusIcon size={14} />}
                onClick={() => set("tilts", [...v.tilts, { pitchDeg: "0", rollDeg: "0" }])}
                disabled={v.tilts.length >= 200}
              >
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
                          onChange={(e) =>
                            set(
                              "tilts",
                              v.tilts.map((x, j) => (j === i ? { ...x, [k]: e.target.value } : x)),
                            )
                          }
                        />
                      </td>
                    ))}
                    <td className="px-1 text-center">
                      <button
                        type="button"
                        aria-label={`Remove tilt ${i + 1}`}
                        disabled={v.tilts.length <= 1}
                        onClick={() =>
                          set(
                            "tilts",
                            v.tilts.filter((_, j) => j !== i),
                          )
                        }
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
              {errors.tilts ??
                `Tilt ${
                  Number(
                    Object.keys(errors)
                      .find((k) => k.startsWith("tilts."))!
                      .split(".")[1],
                  ) + 1
                }: ${errors[Object.keys(errors).find((k) => k.startsWith("tilts."))!]}`}
            </p>
          ) : null}
        </div>
      </div>
    </Panel>
  );
}
