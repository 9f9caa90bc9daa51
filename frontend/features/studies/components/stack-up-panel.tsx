import { useMemo, useState } from "react";
import { Bar, BarChart, CartesianGrid, Legend, Tooltip, XAxis, YAxis } from "recharts";
import { ChartDownload } from "@frontend/components/ui/chart-download";
import type { ResultFile } from "@shared/schemas/result-file";
import { Table, THead, Td, Th, Tr } from "@frontend/components/ui/table";
import { niceCeil } from "../lib/envelope";
import { niceTicks } from "../lib/histogram";
import { parseMetric } from "@shared/metrics";
import { axisLine, axisTick, gridProps, INK, tooltipStyle } from "./chart-theme";
import { SegmentedControl } from "./segmented-control";
import { formatNumber, formatValue } from "@shared/format";

const SERIES = [
  { key: "worstCase", name: "Worst case", colour: "#b91c1c" },
  { key: "rss", name: "RSS", colour: "#c2903f" },
  { key: "mc3Sigma", name: "MC |mean| + 3σ", colour: "#64748b" },
  { key: "mcP9973", name: "MC p99.73", colour: "#17212b" },
] as const;

/**
 * Worst case, RSS and Monte Carlo side by side for the signed metrics (the cross-axis
 * terms): every tolerance at its limit in the worst direction; the root-sum-square of the
 * limits; and what the sample shows.
 */
export function StackUpPanel({ result, elementOrder }: { result: ResultFile; elementOrder: string[] }) {
  const groups = useMemo(() => {
    const g = [...new Set(result.stackUp.map((r) => parseMetric(r.metric).element))];
    const rank = (e: string) => (elementOrder.includes(e) ? elementOrder.indexOf(e) : elementOrder.length);
    return g.sort((a, b) => rank(a) - rank(b));
  }, [result.stackUp, elementOrder]);
  const [group, setGroup] = useState<string>(groups[0] ?? "");
  const rows = result.stackUp.filter((r) => parseMetric(r.metric).element === group);
  if (!result.stackUp.length)
    return <p className="py-6 text-center text-[13px] text-ink/55">This stack has no signed metrics to stack up.</p>;
  const unit = result.metrics[rows[0]?.metric]?.unit ?? "%";
  const data = rows.map((r) => ({ ...r, term: parseMetric(r.metric).axis ?? r.metric }));
  const top = niceCeil(Math.max(0, ...rows.flatMap((r) => [r.worstCase, r.rss, r.mc3Sigma, r.mcP9973])) * 1.05);

  return (
    <div className="flex flex-col gap-2">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <p className="text-xs text-ink/60">
          Cross-axis terms |S<sub>ij</sub>| of <span className="font-mono">{group}</span>, in %
        </p>
        <SegmentedControl label="Stack-up sensor" value={group} onChange={setGroup} options={groups.map((g) => ({ value: g, label: g }))} />
      </div>
      <figure data-chart="stack-up" aria-label={`Stack-up of ${group}`} className="relative min-w-0">
        <ChartDownload
          name={`stack-up-${group}`}
          title={`Worst case, RSS and Monte Carlo of ${group}`}
          className="absolute top-0 right-0"
        />
        <BarChart
          responsive
          style={{ width: "100%", height: 200 }}
          data={data}
          margin={{ top: 8, right: 8, bottom: 0, left: 0 }}
          barGap={1}
          barCategoryGap="18%"
        >
          <CartesianGrid {...gridProps} vertical={false} />
          <XAxis dataKey="term" tick={axisTick} axisLine={axisLine} tickLine={false} height={20} />
          <YAxis
            domain={[0, top]}
            ticks={niceTicks(0, top, 4)}
            tick={axisTick}
            axisLine={axisLine}
            tickLine={false}
            width={46}
            tickFormatter={(v: number) => `${formatNumber(v, 2)}${unit === "%" ? "%" : "°"}`}
          />
          <Tooltip
            {...tooltipStyle}
            cursor={{ fill: INK, fillOpacity: 0.05 }}
            formatter={(v, name) => [formatValue(Number(v), unit), name]}
            labelFormatter={(t) => `${group}.crossAxisPct.${t}`}
          />
          <Legend iconType="square" iconSize={9} wrapperStyle={{ fontSize: 11, paddingTop: 2 }} />
          {SERIES.map((s) => (
            <Bar key={s.key} dataKey={s.key} name={s.name} fill={s.colour} fillOpacity={0.85} isAnimationActive={false} maxBarSize={16} />
          ))}
        </BarChart>
      </figure>
      <div className="overflow-x-auto rounded-md border border-line/80">
        <Table aria-label="Stack-up">
          <THead>
            <tr>
              <Th>Term</Th>
              <Th align="right">Nominal</Th>
              <Th align="right">Worst case</Th>
              <Th align="right">RSS</Th>
              <Th align="right">Lin. 3σ</Th>
              <Th align="right">MC 3σ</Th>
              <Th align="right">MC p99.73</Th>
            </tr>
          </THead>
          <tbody>
            {rows.map((r) => (
              <Tr key={r.metric}>
                <Td className="h-8 text-xs font-semibold" title={r.metric}>
                  {parseMetric(r.metric).axis}
                </Td>
                <Td numeric className="h-8 text-xs text-ink/60">
                  {Math.abs(r.nominal) < 5e-5 ? "0" : formatNumber(r.nominal)}
                </Td>
                <Td numeric className="h-8 text-xs">
                  {formatNumber(r.worstCase)}
                </Td>
                <Td numeric className="h-8 text-xs">
                  {formatNumber(r.rss)}
                </Td>
                <Td numeric className="h-8 text-xs">
                  {formatNumber(r.linear3Sigma)}
                </Td>
                <Td numeric className="h-8 text-xs">
                  {formatNumber(r.mc3Sigma)}
                </Td>
                <Td numeric className="h-8 text-xs font-semibold">
                  {formatNumber(r.mcP9973)}
                </Td>
              </Tr>
            ))}
          </tbody>
        </Table>
      </div>
      <p className="text-2xs text-ink/50">
        Worst case adds every slope × half-width; RSS takes their root-sum-square; “Lin. 3σ” uses the linearised σ and “MC” the sample. All
        in {unit === "%" ? "%" : "deg"}, |nominal| included.
      </p>
    </div>
  );
}
