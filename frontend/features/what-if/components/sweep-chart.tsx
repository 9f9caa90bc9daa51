import {
  Area,
  CartesianGrid,
  ComposedChart,
  Line,
  ReferenceDot,
  ReferenceLine,
  ResponsiveContainer,
  Tooltip,
  XAxis,
  YAxis,
} from "recharts";
import type { Sweep } from "@shared/schemas/what-if";
import { metricLabel } from "@shared/metrics";
import { formatNumberUnit, formatYield } from "@shared/format";
import { PALETTE } from "@shared/palette";
import { axisLabel, axisLine, axisTick, FAIL, gridProps, PASS, tooltipStyle } from "@frontend/features/studies";

/** One requirement's predicted yield against the swept parameter: interval band, target line, crossing marked. */
export function SweepChart({ sweep, k, parameterLabel }: { sweep: Sweep; k: number; parameterLabel: string }) {
  const first = sweep.points[0]?.requirements[k];
  if (!first) return null;
  const rows = sweep.points.map((p) => {
    const r = p.requirements[k];
    return { x: p.value, y: r.predictedYield * 100, band: [r.ci[0] * 100, r.ci[1] * 100] as [number, number], passes: r.passes };
  });
  const target = first.yield * 100;
  const crossing = sweep.crossings[k]?.value ?? null;
  const lows = rows.map((r) => r.band[0]);
  const yMin = Math.max(0, Math.floor(Math.min(target, ...lows) - 0.5));
  const unit = sweep.unit;
  return (
    <figure className="flex flex-col gap-1" aria-label={`${metricLabel(first.metric)} yield against ${parameterLabel}`}>
      <figcaption className="flex flex-wrap items-baseline justify-between gap-2 text-[13px]">
        <span className="font-bold text-ink">
          {metricLabel(first.metric)} ≤ {first.max} · target {formatYield(first.yield)}
        </span>
        <span className="text-ink/65" data-testid={`crossing-${first.metric}`}>
          {crossing === null ? "never meets its target in this range" : `meets its target at ${formatNumberUnit(crossing, unit, 3)}`}
        </span>
      </figcaption>
      <div className="h-56">
        <ResponsiveContainer width="100%" height="100%">
          <ComposedChart data={rows} margin={{ top: 8, right: 16, bottom: 18, left: 8 }}>
            <CartesianGrid {...gridProps} />
            <XAxis
              dataKey="x"
              type="number"
              domain={["dataMin", "dataMax"]}
              tick={axisTick}
              axisLine={axisLine}
              label={axisLabel(parameterLabel)}
            />
            <YAxis domain={[yMin, 100]} tick={axisTick} axisLine={axisLine} unit=" %" width={56} />
            <Tooltip
              {...tooltipStyle}
              formatter={(v, name) =>
                Array.isArray(v)
                  ? [`${Number(v[0]).toFixed(3)} – ${Number(v[1]).toFixed(3)} %`, "95 % interval"]
                  : [`${Number(v).toFixed(3)} %`, String(name)]
              }
              labelFormatter={(x) => formatNumberUnit(Number(x), unit, 4)}
            />
            <Area dataKey="band" stroke="none" fill={PALETTE.gyro} fillOpacity={0.16} isAnimationActive={false} name="95 % interval" />
            <Line dataKey="y" stroke={PALETTE.gyro} strokeWidth={2} dot={{ r: 3 }} isAnimationActive={false} name="predicted yield" />
            <ReferenceLine
              y={target}
              stroke={FAIL}
              strokeDasharray="5 4"
              label={{ value: "target", fontSize: 10, fill: FAIL, position: "insideTopRight" }}
            />
            <ReferenceLine
              x={sweep.current}
              stroke={PALETTE.ink}
              strokeOpacity={0.4}
              label={{ value: "today", fontSize: 10, position: "top" }}
            />
            {crossing !== null ? <ReferenceDot x={crossing} y={target} r={5} fill={PASS} stroke="white" /> : null}
          </ComposedChart>
        </ResponsiveContainer>
      </div>
    </figure>
  );
}
