import { useMemo, useState } from "react";
import { Bar, BarChart, CartesianGrid, Cell, ReferenceLine, Tooltip, XAxis, YAxis } from "recharts";
import { ChartDownload } from "@frontend/components/ui/chart-download";
import { metricLabel } from "@shared/metrics";
import type { ResultFile } from "@shared/schemas/result-file";
import { histogramRows, niceTicks } from "../lib/histogram";
import { axisLine, axisTick, FAIL, gridProps, INK, tooltipStyle } from "./chart-theme";
import { MetricSelect } from "./metric-select";
import { SegmentedControl } from "./segmented-control";
import { formatCount, formatDeg, formatMrad, formatNumber, formatPct, formatValue } from "@shared/format";

/**
 * The distribution of one metric over the trials, with the requirement's limit drawn and the
 * bins past it in the fail colour. Magnitudes are binned on |value| from 0; signed metrics
 * (cross-axis terms) on the signed value, with the limit on both sides.
 */
export function HistogramPanel({
  result,
  metric,
  onMetric,
  elementOrder,
}: {
  result: ResultFile;
  metric: string;
  onMetric: (id: string) => void;
  elementOrder: string[];
}) {
  const [scale, setScale] = useState<"linear" | "log">("linear");
  const ids = Object.keys(result.histograms);
  const h = result.histograms[metric];
  const stats = result.metrics[metric];
  const req = result.requirements.find((r) => r.metric === metric);
  const rows = useMemo(() => (h ? histogramRows(h, req?.max) : []), [h, req?.max]);
  const unit = stats?.unit ?? "deg";
  const data = useMemo(
    () => rows.map((r) => ({ ...r, plotted: scale === "log" ? (r.count > 0 ? r.count : null) : r.count })),
    [rows, scale],
  );
  // Exact, from the requirement's own count; the bins only show where those trials lie.
  const beyond = req ? Math.round((1 - req.predictedYield) * result.trials) : 0;

  return (
    <div className="flex flex-col gap-2">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <MetricSelect
          label="Histogram metric"
          ids={ids}
          value={metric}
          onChange={onMetric}
          elementOrder={elementOrder}
          required={result.requirements.map((r) => r.metric)}
        />
        <SegmentedControl
          label="Count scale"
          value={scale}
          onChange={setScale}
          options={[
            { value: "linear", label: "Linear" },
            { value: "log", label: "Log", title: "A log scale shows the tail past the limit" },
          ]}
        />
      </div>
      {h && stats ? (
        <>
          <figure data-chart="histogram" aria-label={`Histogram of ${metric}`} className="relative min-w-0">
            <ChartDownload name={`histogram-${metric}`} title={`Histogram of ${metricLabel(metric)}`} className="absolute top-0 right-0" />
            <BarChart
              responsive
              style={{ width: "100%", height: 240 }}
              data={data}
              margin={{ top: 14, right: 12, bottom: 4, left: 4 }}
              barCategoryGap={0}
            >
              <CartesianGrid {...gridProps} vertical={false} />
              <XAxis
                dataKey="x"
                type="number"
                domain={[h.edges[0], h.edges[h.edges.length - 1]]}
                ticks={niceTicks(h.edges[0], h.edges[h.edges.length - 1])}
                tick={axisTick}
                axisLine={axisLine}
                tickLine={false}
                tickFormatter={(v: number) => `${formatNumber(v, 2)}${unit === "%" ? " %" : "°"}`}
                label={{
                  value: h.abs ? `absolute value (${unit === "%" ? "%" : "°"})` : `value (${unit === "%" ? "%" : "°"})`,
                  position: "insideBottomRight",
                  offset: -2,
                  fontSize: 10.5,
                  fill: "rgba(23,33,43,0.55)",
                }}
                height={30}
              />
              <YAxis
                scale={scale === "log" ? "log" : "auto"}
                domain={scale === "log" ? [0.8, "auto"] : [0, "auto"]}
                allowDataOverflow={scale === "log"}
                tick={axisTick}
                axisLine={axisLine}
                tickLine={false}
                width={48}
                tickFormatter={(v: number) => formatCount(v)}
              />
              <Tooltip
                {...tooltipStyle}
                cursor={{ fill: INK, fillOpacity: 0.05 }}
                labelFormatter={(_, payload) => {
                  const r = payload?.[0]?.payload as (typeof rows)[number] | undefined;
                  return r ? `${formatValue(r.lo, unit)} … ${formatValue(r.hi, unit)}` : "";
                }}
                formatter={(_, __, item) => {
                  const r = item.payload as (typeof rows)[number];
                  return [`${formatCount(r.count)} trials (${formatPct(r.pct, 2)})`, "In bin"];
                }}
              />
              <Bar dataKey="plotted" isAnimationActive={false} name="Trials">
                {data.map((r, i) => (
                  <Cell key={i} fill={r.beyond ? FAIL : r.straddles ? "#c2603f" : "#5b6470"} fillOpacity={r.beyond ? 0.9 : 0.75} />
                ))}
              </Bar>
              {req ? (
                <ReferenceLine
                  x={req.max}
                  stroke={FAIL}
                  strokeWidth={1.5}
                  strokeDasharray="5 3"
                  label={{
                    value: `limit ${formatNumber(req.max)}${unit === "%" ? " %" : "°"}`,
                    position: "insideTopRight",
                    fontSize: 10.5,
                    fill: FAIL,
                    fontWeight: 700,
                  }}
                />
              ) : null}
              {req && !h.abs ? <ReferenceLine x={-req.max} stroke={FAIL} strokeWidth={1.5} strokeDasharray="5 3" /> : null}
              <ReferenceLine
                x={h.abs ? stats.p9973 : undefined}
                stroke={INK}
                strokeOpacity={0.55}
                strokeDasharray="2 2"
                label={h.abs ? { value: "p99.73", position: "insideTopLeft", fontSize: 10, fill: "rgba(23,33,43,0.6)" } : undefined}
              />
            </BarChart>
          </figure>
          <dl className="grid grid-cols-3 gap-x-4 gap-y-1 border-t border-line/80 pt-2 text-xs sm:grid-cols-6">
            <Stat label="Mean" value={stats.mean} unit={unit} />
            <Stat label="Std dev" value={stats.std} unit={unit} />
            <Stat label="p95, absolute" value={stats.p95} unit={unit} />
            <Stat label="p99.73, absolute" value={stats.p9973} unit={unit} />
            <Stat label="Max, absolute" value={stats.max} unit={unit} />
            <Stat
              label="Past limit"
              text={req ? `${formatCount(beyond)} trials` : "no limit"}
              sub={req ? formatPct((100 * beyond) / result.trials, 2) : undefined}
              tone={req && beyond > 0 ? "fail" : undefined}
            />
          </dl>
        </>
      ) : (
        <p className="py-8 text-center text-[13px] text-ink/55">No histogram for this metric.</p>
      )}
    </div>
  );
}

function Stat({
  label,
  value,
  unit,
  text,
  sub,
  tone,
}: {
  label: string;
  value?: number;
  unit?: "deg" | "%";
  text?: string;
  sub?: string;
  tone?: "fail";
}) {
  const main = text ?? (unit === "%" ? formatPct(value ?? NaN) : formatDeg(value ?? NaN));
  const below = sub ?? (unit === "deg" && value !== undefined ? formatMrad(value) : undefined);
  return (
    <div className="min-w-0">
      <dt className="text-2xs font-bold tracking-[0.06em] text-ink/45 uppercase">{label}</dt>
      <dd className={`font-semibold tabular-nums ${tone === "fail" ? "text-fail" : "text-ink"}`}>
        {main}
        {below ? <span className="block text-2xs font-normal text-ink/50">{below}</span> : null}
      </dd>
    </div>
  );
}
