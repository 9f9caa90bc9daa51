import { useMemo, useState } from "react";
import { Area, CartesianGrid, ComposedChart, Line, LineChart, ReferenceLine, Tooltip, XAxis, YAxis } from "recharts";
import { ChartDownload } from "@frontend/components/ui/chart-download";
import type { ResultFile } from "@shared/schemas/result-file";
import { Select } from "@frontend/components/ui/field";
import { lateDrift, statRows, yieldRows, type ConvergenceStat } from "../lib/convergence";
import { niceTicks } from "../lib/histogram";
import { metricLabel } from "@shared/metrics";
import { axisLine, axisTick, FAIL, gridProps, INK, SERIES_A, tooltipStyle } from "./chart-theme";
import { formatCount, formatNumber, formatPct, formatValue, formatYield } from "@shared/format";

const pLabel = (p: number) => `p${formatNumber(p * 100, 4)}`;
const trialsTick = (v: number) => (v >= 1e6 ? `${formatNumber(v / 1e6, 2)}M` : v >= 1000 ? `${Math.round(v / 1000)}k` : String(v));

/**
 * How a tracked metric's percentile settles as trials accumulate, at the checkpoints the
 * engine records (doubling trial counts), and the yield with its 95 % interval narrowing.
 * A flat tail means more trials would not move the figure.
 */
export function ConvergencePanel({ result, metric, onMetric }: { result: ResultFile; metric: string; onMetric: (id: string) => void }) {
  const tracked = result.convergence.find((c) => c.metric === metric) ?? result.convergence[0];
  const [stat, setStat] = useState<ConvergenceStat>("pAtCoverage");
  const unit = tracked ? (result.metrics[tracked.metric]?.unit ?? "deg") : "deg";
  const req = tracked ? result.requirements.find((r) => r.metric === tracked.metric) : undefined;
  const stats: { value: ConvergenceStat; label: string }[] = tracked
    ? [
        { value: "pAtCoverage", label: `${pLabel(tracked.p)} (${req ? "at the yield target" : "at the coverage"})` },
        { value: "p95", label: "p95" },
        { value: "p99", label: "p99" },
        { value: "p9973", label: "p99.73" },
        { value: "mean", label: "Mean" },
      ]
    : [];
  const data = useMemo(() => (tracked ? statRows(tracked, stat) : []), [tracked, stat]);
  const yields = useMemo(() => (tracked && req ? yieldRows(tracked) : []), [tracked, req]);
  const yieldDomain = useMemo((): [number, number] => {
    if (!yields.length || !req) return [0, 100];
    const lo = Math.min(req.yield * 100, ...yields.map((y) => y.band[0]));
    const hi = Math.max(req.yield * 100, ...yields.map((y) => y.band[1]));
    const pad = Math.max((hi - lo) * 0.12, 0.005);
    return [Math.max(0, lo - pad), Math.min(100, hi + pad)];
  }, [yields, req]);
  if (!tracked) return <p className="py-6 text-center text-[13px] text-ink/55">No convergence record in this result.</p>;
  const last = data[data.length - 1]?.value;
  const drift = lateDrift(data);
  const statLabel = stats.find((s) => s.value === stat)?.label ?? "";
  const xAxis = (
    <XAxis
      dataKey="trials"
      type="number"
      scale="log"
      domain={["dataMin", "dataMax"]}
      ticks={data.map((d) => d.trials)}
      tick={axisTick}
      axisLine={axisLine}
      tickLine={false}
      tickFormatter={trialsTick}
      height={22}
    />
  );

  return (
    <div className="flex flex-col gap-2">
      <div className="flex flex-wrap items-center gap-2">
        <div className="w-64">
          <Select compact aria-label="Convergence metric" value={tracked.metric} onChange={(e) => onMetric(e.target.value)}>
            {result.convergence.map((c) => (
              <option key={c.metric} value={c.metric}>
                {metricLabel(c.metric)}
              </option>
            ))}
          </Select>
        </div>
        <div className="w-56">
          <Select compact aria-label="Convergence percentile" value={stat} onChange={(e) => setStat(e.target.value as ConvergenceStat)}>
            {stats.map((s) => (
              <option key={s.value} value={s.value}>
                {s.label}
              </option>
            ))}
          </Select>
        </div>
      </div>
      <figure data-chart="convergence" aria-label={`Convergence of ${tracked.metric}`} className="min-w-0">
        <figcaption className="flex items-center justify-between gap-2 text-[11.5px] font-bold text-ink">
          {statLabel} of the absolute value
          <ChartDownload name={`convergence-${tracked.metric}`} title={`Convergence of ${metricLabel(tracked.metric)}, ${statLabel}`} />
        </figcaption>
        <LineChart responsive style={{ width: "100%", height: 170 }} data={data} margin={{ top: 8, right: 14, bottom: 0, left: 4 }}>
          <CartesianGrid {...gridProps} />
          {xAxis}
          <YAxis
            domain={["auto", "auto"]}
            tick={axisTick}
            axisLine={axisLine}
            tickLine={false}
            width={52}
            tickFormatter={(v: number) => `${formatNumber(v, 3)}${unit === "%" ? " %" : "°"}`}
          />
          <Tooltip
            {...tooltipStyle}
            labelFormatter={(v) => `${formatCount(Number(v))} trials`}
            formatter={(v) => [formatValue(Number(v), unit), statLabel]}
          />
          {last !== undefined && Number.isFinite(last) ? (
            <ReferenceLine y={last} stroke={INK} strokeOpacity={0.35} strokeDasharray="3 3" />
          ) : null}
          {req && stat === "pAtCoverage" ? (
            <ReferenceLine
              y={req.max}
              stroke={FAIL}
              strokeDasharray="5 3"
              ifOverflow="extendDomain"
              label={{ value: "limit", position: "insideTopRight", fontSize: 10.5, fill: FAIL, fontWeight: 700 }}
            />
          ) : null}
          <Line
            dataKey="value"
            stroke={SERIES_A}
            strokeWidth={1.75}
            dot={{ r: 3, fill: SERIES_A, strokeWidth: 0 }}
            isAnimationActive={false}
            name={statLabel}
          />
        </LineChart>
      </figure>
      {yields.length ? (
        <figure data-chart="convergence-yield" aria-label={`Yield convergence of ${tracked.metric}`} className="min-w-0">
          <figcaption className="flex items-center justify-between gap-2 text-[11.5px] font-bold text-ink">
            Predicted yield with its 95 % interval
            <ChartDownload
              name={`yield-convergence-${tracked.metric}`}
              title={`Predicted yield of ${metricLabel(tracked.metric)} against trials`}
            />
          </figcaption>
          <ComposedChart responsive style={{ width: "100%", height: 150 }} data={yields} margin={{ top: 8, right: 14, bottom: 0, left: 4 }}>
            <CartesianGrid {...gridProps} />
            {xAxis}
            <YAxis
              domain={yieldDomain}
              ticks={niceTicks(yieldDomain[0], yieldDomain[1], 4)}
              tick={axisTick}
              axisLine={axisLine}
              tickLine={false}
              width={52}
              tickFormatter={(v: number) => `${formatNumber(v, 4)}%`}
            />
            <Tooltip
              {...tooltipStyle}
              labelFormatter={(v) => `${formatCount(Number(v))} trials`}
              formatter={(v, name) => [
                Array.isArray(v) ? `${formatYield(Number(v[0]) / 100)} – ${formatYield(Number(v[1]) / 100)}` : formatYield(Number(v) / 100),
                name,
              ]}
            />
            <ReferenceLine
              y={req!.yield * 100}
              stroke={FAIL}
              strokeDasharray="5 3"
              ifOverflow="extendDomain"
              label={{ value: "target", position: "insideTopRight", fontSize: 10.5, fill: FAIL, fontWeight: 700 }}
            />
            <Area
              dataKey="band"
              name="95 % interval"
              stroke="none"
              fill={SERIES_A}
              fillOpacity={0.18}
              isAnimationActive={false}
              activeDot={false}
            />
            <Line
              dataKey="yield"
              name="Yield"
              stroke={SERIES_A}
              strokeWidth={1.75}
              dot={{ r: 2.5, fill: SERIES_A, strokeWidth: 0 }}
              isAnimationActive={false}
            />
          </ComposedChart>
        </figure>
      ) : null}
      <p className="text-2xs text-ink/50">
        Final {statLabel}: <span className="font-semibold text-ink">{last !== undefined ? formatValue(last, unit) : "—"}</span> after{" "}
        {formatCount(result.trials)} trials
        {drift !== null ? `; it moved at most ${formatPct(drift, 2)} over the last half of the run` : ""}.
        {result.adaptive
          ? ` Adaptive stopping (${result.adaptive.method}, ${result.adaptive.significantDigits} significant digit${result.adaptive.significantDigits === 1 ? "" : "s"}): ${result.adaptive.converged ? "converged" : "not converged"} after ${result.adaptive.runs} runs of ${formatCount(result.adaptive.runTrials)}.`
          : ""}
      </p>
    </div>
  );
}
