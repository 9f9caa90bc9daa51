import { useMemo, useState } from "react";
import type { ResultFile } from "@shared/schemas/result-file";
import { AXES, crossAxisMatrix, crossAxisSensors, heat } from "../lib/cross-axis";
import { PERCENTILES, percentileLabel, type PercentileKey } from "../lib/percentiles";
import { SENSOR_COLOUR } from "./chart-theme";
import { SegmentedControl } from "./segmented-control";
import { formatDeg, formatMrad, formatNumber } from "@shared/format";

/**
 * Each sensor's 3×3 cross-axis matrix at the chosen percentile, shaded by size. Row i is the
 * sensor's axis, column j the board axis it picks up (S_ij, %). The diagonal is 100 % by
 * definition and shows the axis misalignment instead.
 */
export function CrossAxisTables({
  result,
  kindOf,
  elementOrder,
}: {
  result: ResultFile;
  kindOf: (id: string) => string | undefined;
  elementOrder: string[];
}) {
  const [pct, setPct] = useState<PercentileKey>("p9973");
  const sensors = useMemo(() => crossAxisSensors(result.metrics, elementOrder), [result.metrics, elementOrder]);
  const matrices = useMemo(() => sensors.map((s) => crossAxisMatrix(result.metrics, s, pct)), [sensors, result.metrics, pct]);
  const scale = Math.max(...matrices.map((m) => m.max), 0);
  if (!sensors.length) return <p className="text-[13px] text-ink/55">This stack has no sensors.</p>;
  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <p className="text-xs text-ink/60">
          |S<sub>ij</sub>| at {percentileLabel(pct)} of trials, in % of the axis's own sensitivity
        </p>
        <SegmentedControl
          label="Cross-axis percentile"
          value={pct}
          onChange={setPct}
          options={PERCENTILES.map((p) => ({ value: p.key, label: p.label }))}
        />
      </div>
      <div className="grid gap-x-3 gap-y-4 sm:grid-cols-3">
        {matrices.map((m) => {
          const colour = SENSOR_COLOUR[kindOf(m.sensor) ?? ""] ?? "#64748b";
          return (
            <table
              key={m.sensor}
              aria-label={`${m.sensor} cross-axis at ${percentileLabel(pct)}`}
              className="w-full border-collapse text-xs"
              data-chart="cross-axis"
            >
              <caption className="mb-1 text-left text-[12px] font-bold text-ink">
                <span className="mr-1.5 inline-block size-2 rounded-full align-middle" style={{ background: colour }} aria-hidden="true" />
                {m.sensor}
                {kindOf(m.sensor) && kindOf(m.sensor) !== m.sensor ? (
                  <span className="ml-1.5 font-normal text-ink/45">{kindOf(m.sensor)}</span>
                ) : null}
              </caption>
              <thead>
                <tr>
                  <th
                    scope="col"
                    className="w-5 text-left text-[10px] font-semibold text-ink/40"
                    title="Row: the sensor's axis; column: the board axis it picks up"
                  >
                    <span className="sr-only">sensor axis, board axis</span>
                  </th>
                  {AXES.map((j) => (
                    <th key={j} scope="col" className="h-6 text-right text-2xs font-bold tracking-[0.04em] text-ink/55 uppercase">
                      {j}
                    </th>
                  ))}
                </tr>
              </thead>
              <tbody>
                {AXES.map((i, r) => (
                  <tr key={i}>
                    <th scope="row" className="text-left text-2xs font-bold tracking-[0.04em] text-ink/55 uppercase">
                      {i}
                    </th>
                    {AXES.map((j, c) => {
                      const v = m.cells[r][c];
                      if (r === c) {
                        const mis = m.misalignDeg[r];
                        return (
                          <td
                            key={j}
                            className="h-11 border border-line/70 bg-paper px-1 text-right align-middle text-ink/45"
                            title={
                              mis === null ? "100 % by definition" : `Axis misalignment of ${i}: ${formatDeg(mis)} (${formatMrad(mis)})`
                            }
                          >
                            <div className="leading-tight tabular-nums">—</div>
                            {mis !== null ? <div className="text-[10px] leading-tight tabular-nums">∠ {formatDeg(mis, 2)}</div> : null}
                          </td>
                        );
                      }
                      const t = heat(v, scale);
                      return (
                        <td
                          key={j}
                          className="h-11 border border-line/70 px-1 text-right align-middle font-semibold tabular-nums"
                          style={{
                            background: `color-mix(in srgb, ${colour} ${Math.round(8 + 72 * t)}%, white)`,
                            color: t > 0.55 ? "white" : "#17212b",
                          }}
                          title={`${m.sensor} ${i} picks up ${formatNumber(v ?? NaN)} % of board ${j} at ${percentileLabel(pct)}`}
                        >
                          {v === null ? "—" : `${formatNumber(v, 3)}`}
                          <span className="ml-0.5 text-[10px] font-normal opacity-70">%</span>
                        </td>
                      );
                    })}
                  </tr>
                ))}
              </tbody>
            </table>
          );
        })}
      </div>
      <p className="text-2xs text-ink/50">
        Shading runs from 0 to the largest term of any sensor ({formatNumber(scale)} %). The diagonal shows the axis misalignment (∠) at the
        same percentile. 1° of misalignment gives about 1.75 % cross-axis.
      </p>
    </div>
  );
}
