import { useState } from "react";
import type { ResultFile } from "@shared/schemas/result-file";
import { Button } from "@frontend/components/ui/button";
import { Table, THead, Td, Th, Tr } from "@frontend/components/ui/table";
import { cn } from "@frontend/lib/cn";
import { groupMetrics, metricLabel } from "@shared/metrics";
import { MRAD_PER_DEG, formatNumber } from "@shared/format";

/**
 * Every metric of the study with its mean, σ and shortest 95 % coverage interval (signed),
 * and the percentiles and maximum of |value|; angles in degrees with milliradians beside.
 * Requirement metrics first and marked.
 */
export function MetricsTable({ result, elementOrder }: { result: ResultFile; elementOrder: string[] }) {
  const [all, setAll] = useState(false);
  const required = new Set(result.requirements.map((r) => r.metric));
  const limits = new Map(result.requirements.map((r) => [r.metric, r.max] as const));
  const groups = groupMetrics(Object.keys(result.metrics), elementOrder);
  const shown = all ? groups : [{ label: "Requirement metrics", ids: result.requirements.map((r) => r.metric) }];
  const count = Object.keys(result.metrics).length;
  return (
    <div className="flex flex-col gap-2">
      <div className="overflow-x-auto rounded-md border border-line/80">
        <Table aria-label="Metric statistics">
          <THead>
            <tr>
              <Th>Metric</Th>
              <Th align="right">Unit</Th>
              <Th align="right">Mean</Th>
              <Th align="right">σ</Th>
              <Th align="right" title="Shortest interval holding 95 % of the signed values (JCGM 101 5.3)">
                95 % interval
              </Th>
              <Th align="right">p50</Th>
              <Th align="right">p95</Th>
              <Th align="right">p99</Th>
              <Th align="right">p99.73</Th>
              <Th align="right">Max</Th>
              <Th align="right">p99.73 mrad</Th>
              <Th align="right">Limit</Th>
            </tr>
          </THead>
          {shown.map((g) => (
            <tbody key={g.label}>
              {all ? (
                <tr className="border-b border-line/70 bg-paper/70">
                  <th
                    colSpan={12}
                    scope="colgroup"
                    className="px-3 py-1 text-left text-2xs font-bold tracking-[0.06em] text-ink/55 uppercase"
                  >
                    {g.label}
                  </th>
                </tr>
              ) : null}
              {g.ids.map((id) => {
                const m = result.metrics[id];
                if (!m) return null;
                const limit = limits.get(id);
                const over = (v: number) => limit !== undefined && v > limit;
                return (
                  <Tr key={id}>
                    <Td className="h-8 text-xs">
                      <span className={cn("font-semibold", required.has(id) ? "text-ink" : "text-ink/80")}>{metricLabel(id)}</span>
                      <span className="ml-2 font-mono text-2xs text-ink/45">{id}</span>
                    </Td>
                    <Td numeric className="h-8 text-xs text-ink/55">
                      {m.unit === "%" ? "%" : "deg"}
                    </Td>
                    <Td numeric className="h-8 text-xs">
                      {formatNumber(m.mean)}
                    </Td>
                    <Td numeric className="h-8 text-xs">
                      {formatNumber(m.std)}
                    </Td>
                    <Td numeric className="h-8 text-xs text-ink/60">
                      {(() => {
                        // Written by engines from 1.0.0 on; older result files lack them.
                        const c = m as { shortest95?: [number, number]; interval95?: [number, number] };
                        const iv = c.shortest95 ?? c.interval95;
                        return iv ? `${formatNumber(iv[0])} … ${formatNumber(iv[1])}` : "—";
                      })()}
                    </Td>
                    <Td numeric className="h-8 text-xs">
                      {formatNumber(m.p50)}
                    </Td>
                    <Td numeric className={cn("h-8 text-xs", over(m.p95) && "text-fail")}>
                      {formatNumber(m.p95)}
                    </Td>
                    <Td numeric className={cn("h-8 text-xs", over(m.p99) && "text-fail")}>
                      {formatNumber(m.p99)}
                    </Td>
                    <Td numeric className={cn("h-8 text-xs font-semibold", over(m.p9973) && "text-fail")}>
                      {formatNumber(m.p9973)}
                    </Td>
                    <Td numeric className="h-8 text-xs">
                      {formatNumber(m.max)}
                    </Td>
                    <Td numeric className="h-8 text-xs text-ink/55">
                      {m.unit === "deg" ? formatNumber(m.p9973 * MRAD_PER_DEG) : ""}
                    </Td>
                    <Td numeric className="h-8 text-xs text-ink/70">
                      {limit !== undefined ? formatNumber(limit) : ""}
                    </Td>
                  </Tr>
                );
              })}
            </tbody>
          ))}
        </Table>
      </div>
      <div>
        <Button size="sm" variant="ghost" onClick={() => setAll((v) => !v)} aria-expanded={all}>
          {all ? "Show requirement metrics only" : `Show all ${count} metrics`}
        </Button>
      </div>
    </div>
  );
}
