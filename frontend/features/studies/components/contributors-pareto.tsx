import { useMemo } from "react";
import { Bar, CartesianGrid, Cell, ComposedChart, Line, Tooltip, XAxis, YAxis } from "recharts";
import { ChartDownload } from "@frontend/components/ui/chart-download";
import type { ResultFile } from "@shared/schemas/result-file";
import { Table, THead, Td, Th, Tr } from "@frontend/components/ui/table";
import { metricLabel } from "@shared/metrics";
import { mcShares, type McShare } from "@shared/contributor-significance";
import { paretoRows, sourcesToReach, type ContributorMethod, type ParetoRow } from "../lib/pareto";
import { axisLine, axisTick, gridProps, INK, SENSOR_COLOUR, tooltipStyle } from "./chart-theme";
import { MetricSelect } from "./metric-select";
import { formatNumber, formatPct, formatShare, formatValue } from "@shared/format";

type Contributors = ResultFile["contributors"][number];

/**
 * The tolerance sources ranked by their share of a requirement metric's variance, as Pareto
 * charts (bars and the running total): one from the model linearised at nominal, one from
 * the Monte Carlo sample's regression. Below them every source with its owner and stage.
 */
export function ContributorsPanel({
  result,
  metric,
  onMetric,
  kindOf,
  elementOrder,
}: {
  result: ResultFile;
  metric: string;
  onMetric: (id: string) => void;
  kindOf: (id: string) => string | undefined;
  elementOrder: string[];
}) {
  const c = result.contributors.find((x) => x.metric === metric) ?? result.contributors[0];
  if (!c) {
    return (
      <p className="py-6 text-center text-[13px] text-ink/55">Contributors are worked out for requirement metrics; this study has none.</p>
    );
  }
  const colourOf = (source: string) => {
    const head = source.startsWith("calibration.") ? source.slice(12) : source.split(".")[0];
    return SENSOR_COLOUR[kindOf(head) ?? ""] ?? "#64748b";
  };
  const basis = c.basis === "variance" ? "variance" : "mean square";
  const draws = new Map(result.sources.map((x) => [x.id, x.draws] as const));
  const mc = mcShares(c, result.trials, (id) => draws.get(id) ?? 1);
  const significant = new Set([...mc.values()].filter((x) => x.significant).map((x) => x.source));
  const dropped = c.sources.filter((x) => (x.mcShare ?? 0) > 0 && !significant.has(x.source)).length;
  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <MetricSelect
          label="Contributors for requirement"
          ids={result.contributors.map((x) => x.metric)}
          value={c.metric}
          onChange={onMetric}
          elementOrder={elementOrder}
          className="w-96"
        />
        <p className="text-xs text-ink/60">
          Share of the {basis} of <span className="font-semibold text-ink">{metricLabel(c.metric)}</span>
          {c.basis === "meanSquare" ? " (a magnitude: its spread is read on its square)" : ""}
        </p>
      </div>
      <div className="grid gap-3 lg:grid-cols-2">
        <ParetoChart
          title="Linearised at nominal"
          note={`Central differences at the mean of every source; √Σ = ${formatValue(c.linearTotal, result.metrics[c.metric]?.unit === "%" ? "%" : "deg")}`}
          rows={paretoRows(c, "linear")}
          method="linear"
          colourOf={colourOf}
          metric={c.metric}
        />
        <ParetoChart
          title="Monte Carlo regression"
          note={
            c.mcR2 === null
              ? "Not enough trials for the regression"
              : `SRC² of ${c.mcDesign === "squared" ? "the squared metric on squared deviations" : "the metric on the draws"}; sources whose share is not told apart from zero at 95 % are left out${dropped ? ` (${dropped})` : ""}`
          }
          rows={paretoRows(c, "mc", undefined, significant)}
          method="mc"
          colourOf={colourOf}
          metric={c.metric}
        />
      </div>
      {c.mcR2 !== null ? (
        <p className="text-2xs text-ink/55">
          R² = {formatNumber(c.mcR2, 2)}: the regression on the sources explains {formatPct(100 * c.mcR2, 2)} of the metric&apos;s spread in
          this sample.{" "}
          {c.mcR2 < 0.6
            ? "The metric is far from linear in its sources (a maximum over attitudes, a magnitude), so read its ranking rather than its exact shares."
            : "The rest is what a straight-line fit cannot follow (curvature, interactions) and sampling noise."}
        </p>
      ) : null}
      <SourcesTable contributors={c} sources={result.sources} colourOf={colourOf} mc={mc} />
    </div>
  );
}

function ParetoChart({
  title,
  note,
  rows,
  method,
  colourOf,
  metric,
}: {
  title: string;
  metric: string;
  note: string;
  rows: ParetoRow[];
  method: ContributorMethod;
  colourOf: (source: string) => string;
}) {
  const few = sourcesToReach(rows, 80);
  return (
    <figure
      className="min-w-0 rounded-md border border-line/80 bg-white/60 p-2"
      data-chart="pareto"
      aria-label={`Pareto of contributors, ${title}`}
    >
      <figcaption className="flex flex-wrap items-baseline justify-between gap-x-3 px-1">
        <span className="text-[12px] font-bold text-ink">{title}</span>
        <span className="flex items-center gap-2 text-2xs text-ink/55">
          {rows.length ? `${few} source${few === 1 ? "" : "s"} make 80 %` : ""}
          {rows.length ? (
            <ChartDownload
              name={`contributors-${metric}-${method}`}
              title={`Contributors to ${metricLabel(metric)}, ${title.toLowerCase()}`}
            />
          ) : null}
        </span>
      </figcaption>
      <p className="px-1 text-2xs text-ink/50">{note}</p>
      {rows.length ? (
        <ComposedChart responsive style={{ width: "100%", height: 250 }} data={rows} margin={{ top: 10, right: 4, bottom: 0, left: 0 }}>
          <CartesianGrid {...gridProps} vertical={false} />
          <XAxis
            dataKey="source"
            interval={0}
            angle={-38}
            textAnchor="end"
            height={78}
            tick={{ ...axisTick, fontSize: 10 }}
            axisLine={axisLine}
            tickLine={false}
          />
          <YAxis
            yAxisId="share"
            domain={[0, 100]}
            ticks={[0, 25, 50, 75, 100]}
            tick={axisTick}
            axisLine={axisLine}
            tickLine={false}
            width={38}
            tickFormatter={(v: number) => `${v} %`}
          />
          <YAxis
            yAxisId="cum"
            orientation="right"
            domain={[0, 100]}
            ticks={[0, 80, 100]}
            tick={axisTick}
            axisLine={axisLine}
            tickLine={false}
            width={42}
            tickFormatter={(v: number) => `${v} %`}
          />
          <Tooltip
            {...tooltipStyle}
            cursor={{ fill: INK, fillOpacity: 0.05 }}
            formatter={(value, name, item) => {
              const r = item.payload as ParetoRow;
              if (name === "Running total") return [formatShare(Number(value) / 100), name];
              const other =
                r.otherShare === null ? "" : ` (${method === "linear" ? "Monte Carlo" : "linearised"} ${formatShare(r.otherShare / 100)})`;
              return [`${formatShare(Number(value) / 100)}${other}`, "Share"];
            }}
          />
          <Bar yAxisId="share" dataKey="share" name="Share" isAnimationActive={false} maxBarSize={34}>
            {rows.map((r) => (
              <Cell key={r.source} fill={r.count > 1 ? "#b8b2a3" : colourOf(r.source)} fillOpacity={0.85} />
            ))}
          </Bar>
          <Line
            yAxisId="cum"
            dataKey="cumulative"
            name="Running total"
            stroke={INK}
            strokeWidth={1.5}
            dot={{ r: 2.5, fill: INK, strokeWidth: 0 }}
            isAnimationActive={false}
          />
        </ComposedChart>
      ) : (
        <p className="py-16 text-center text-[13px] text-ink/55">No shares from this method.</p>
      )}
    </figure>
  );
}

function SourcesTable({
  contributors,
  sources,
  colourOf,
  mc,
}: {
  contributors: Contributors;
  sources: ResultFile["sources"];
  colourOf: (source: string) => string;
  mc: Map<string, McShare>;
}) {
  const info = useMemo(() => new Map(sources.map((s) => [s.id, s] as const)), [sources]);
  // a source with no linearised effect and no share told apart from zero moves nothing
  const rows = contributors.sources.filter((s) => s.linearShare > 0 || mc.get(s.source)?.significant);
  return (
    <div className="max-h-72 overflow-y-auto rounded-md border border-line/80">
      <Table aria-label="Tolerance sources">
        <THead className="sticky top-0 bg-paper">
          <tr>
            <Th>Source</Th>
            <Th>Owner</Th>
            <Th>Stage</Th>
            <Th align="right">Tolerance</Th>
            <Th align="right">Linearised</Th>
            <Th align="right">Monte Carlo</Th>
          </tr>
        </THead>
        <tbody>
          {rows.map((s) => {
            const src = info.get(s.source);
            const unit = src?.unit === "um" ? "µm" : "°";
            return (
              <Tr key={s.source}>
                <Td className="h-8 font-mono text-xs">
                  <span
                    className="mr-1.5 inline-block size-2 rounded-sm align-middle"
                    style={{ background: colourOf(s.source) }}
                    aria-hidden="true"
                  />
                  {s.source}
                </Td>
                <Td className="h-8 text-xs text-ink/70">{src?.owner ?? "—"}</Td>
                <Td className="h-8 text-xs text-ink/70">{src?.stage ?? "—"}</Td>
                <Td numeric className="h-8 text-xs">
                  {src ? `${src.mean ? `${formatNumber(src.mean)} ` : ""}± ${formatNumber(src.halfWidth)} ${unit}` : "—"}
                </Td>
                <Td numeric className="h-8 text-xs font-semibold">
                  {formatShare(s.linearShare)}
                </Td>
                <Td numeric className="h-8 text-xs">
                  <McCell share={mc.get(s.source)} regression={s.mcShare !== null} />
                </Td>
              </Tr>
            );
          })}
        </tbody>
      </Table>
    </div>
  );
}

/** A Monte Carlo share with its 95 % interval, or why there is none. */
function McCell({ share, regression }: { share: McShare | undefined; regression: boolean }) {
  if (!regression) return <>—</>;
  if (!share) return <span className="text-ink/45">no effect</span>;
  if (!share.significant) return <span className="text-ink/45">not told from 0</span>;
  return (
    <span title="Share of the regression and its 95 % interval">
      {formatShare(share.share)}
      <span className="ml-1 text-2xs text-ink/50">
        ({formatShare(share.lo)} – {formatShare(share.hi)})
      </span>
    </span>
  );
}
