import type { UseQueryResult } from "@tanstack/react-query";
import { WMM_FIRST_DATE, WMM_LAST_DATE } from "@shared/schemas/site";
import { Field, Input } from "@frontend/components/ui/field";
import { Panel } from "@frontend/components/ui/panel";
import { FieldFound, type FoundField } from "./field-found";
import { SegmentedControl } from "./segmented-control";
import type { SettingsSectionProps } from "./settings-section-props";
import { formatMrad, formatNumber } from "@shared/format";

/** The magnetic field's inclination: typed, or looked up for a site with WMM2025. */
export function SettingsFieldPanel({
  v,
  set,
  errors,
  site,
  field,
}: SettingsSectionProps & { site: unknown; field: UseQueryResult<FoundField> & { isPlaceholderData: boolean } }) {
  return (
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
            hint={
              Number.isFinite(Number(v.inclinationDeg)) && v.inclinationDeg.trim()
                ? `${formatMrad(Number(v.inclinationDeg), 4)}; tan I = ${formatNumber(Math.tan((Number(v.inclinationDeg) * Math.PI) / 180))}`
                : undefined
            }
          >
            {({ id, describedBy, invalid }) => (
              <Input
                id={id}
                compact
                inputMode="decimal"
                className="text-right tabular-nums"
                aria-describedby={describedBy}
                invalid={invalid}
                value={v.inclinationDeg}
                onChange={(e) => set("inclinationDeg", e.target.value)}
              />
            )}
          </Field>
        </div>
      ) : (
        <div className="mt-3 grid gap-4 md:grid-cols-[minmax(0,1fr)_260px]">
          <div className="grid grid-cols-2 gap-3 sm:grid-cols-4">
            <Field label="Latitude" aside="deg N" error={errors.latitudeDeg}>
              {({ id, describedBy, invalid }) => (
                <Input
                  id={id}
                  compact
                  inputMode="decimal"
                  className="text-right tabular-nums"
                  aria-describedby={describedBy}
                  invalid={invalid}
                  value={v.latitudeDeg}
                  placeholder="47.27"
                  onChange={(e) => set("latitudeDeg", e.target.value)}
                />
              )}
            </Field>
            <Field label="Longitude" aside="deg E" error={errors.longitudeDeg}>
              {({ id, describedBy, invalid }) => (
                <Input
                  id={id}
                  compact
                  inputMode="decimal"
                  className="text-right tabular-nums"
                  aria-describedby={describedBy}
                  invalid={invalid}
                  value={v.longitudeDeg}
                  placeholder="11.39"
                  onChange={(e) => set("longitudeDeg", e.target.value)}
                />
              )}
            </Field>
            <Field label="Altitude" aside="km" error={errors.altitudeKm}>
              {({ id, describedBy, invalid }) => (
                <Input
                  id={id}
                  compact
                  inputMode="decimal"
                  className="text-right tabular-nums"
                  aria-describedby={describedBy}
                  invalid={invalid}
                  value={v.altitudeKm}
                  onChange={(e) => set("altitudeKm", e.target.value)}
                />
              )}
            </Field>
            <Field label="Date" error={errors.date}>
              {({ id, describedBy, invalid }) => (
                <Input
                  id={id}
                  compact
                  type="date"
                  min={WMM_FIRST_DATE}
                  max={WMM_LAST_DATE}
                  aria-describedby={describedBy}
                  invalid={invalid}
                  value={v.date}
                  onChange={(e) => set("date", e.target.value)}
                />
              )}
            </Field>
          </div>
          <FieldFound
            state={
              site === null
                ? "incomplete"
                : field.isError
                  ? "error"
                  : field.isFetching && !field.data
                    ? "loading"
                    : field.data
                      ? "found"
                      : "loading"
            }
            data={field.data}
            error={field.error?.message}
            stale={field.isPlaceholderData}
          />
        </div>
      )}
    </Panel>
  );
}
