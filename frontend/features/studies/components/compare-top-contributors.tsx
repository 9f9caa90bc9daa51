import { useState } from "react";
import type { ResultFile } from "@shared/schemas/result-file";
import { Badge } from "@frontend/components/ui/badge";
import { Select } from "@frontend/components/ui/field";
import { Table, THead, Td, Th, Tr } from "@frontend/components/ui/table";
import { cn } from "@frontend/lib/cn";
import { metricLabel } from "@shared/metrics";
import { ABLabel, signed } from "./compare-parts";
import { formatPct } from "@shared/format";

/** The largest linearised shares of one requirement metric in A and B. */
export function TopContributors({ ra, rb }: { ra: ResultFile; rb: ResultFile }) {
  const metrics = ra.contributors.map((c) => c.metric).filter((m) => rb.contributors.some((c) => c.metric === m));
  const [metric, setMetric] = useState(metrics[0] ?? "");
  const ca = ra.contributors.find((c) => c.metric === metric);
  const cb = rb.contributors.find((c) => c.metric === metric);
  if (!ca || !cb) return <p className="text-[13px] text-ink/60">The two studies share no requirement metric.</p>;
  const sources = [...new Set([...ca.sources.slice(0, 6).map((s) => s.source), ...cb.sources.slice(0, 6).map((s) => s.source)])];
  const share = (c: typeof ca, s: string) => 100 * (c.sources.find((x) => x.source === s)?.linearShare ?? 0);
  const rows = sources.map((s) => ({ s, a: share(ca, s), b: share(cb, s) })).sort((x, y) => y.b - x.b);
  return (
    <div className="flex flex-col gap-2">
      <div className="w-72">
        <Select compact aria-label="Contributors compared for" value={metric} onChange={(e) => setMetric(e.target.value)}>
          {metrics.map((m) => (
            <option key={m} value={m}>
              {metricLabel(m)}
            </option>
          ))}
        </Select>
      </div>
      <div className="overflow-x-auto rounded-md border border-line/80">
        <Table aria-label="Contributors compared">
          <THead>
            <tr>
              <Th>Source</Th>
              <Th align="right">
                <ABLabel side="a" />
                Share
              </Th>
              <Th align="right">
                <ABLabel side="b" />
                Share
              </Th>
              <Th align="right">Change</Th>
            </tr>
          </THead>
          <tbody>
            {rows.map((r) => {
              const d = r.b - r.a;
              return (
                <Tr key={r.s}>
                  <Td className="h-8 font-mono text-xs">{r.s}</Td>
                  <Td numeric className="h-8 text-xs">
                    {formatPct(r.a, 3)}
                  </Td>
                  <Td numeric className="h-8 text-xs font-semibold">
                    {formatPct(r.b, 3)}
                  </Td>
                  <Td numeric className={cn("h-8 text-xs", Math.abs(d) >= 5 ? "font-semibold text-ink" : "text-ink/50")}>
                    {signed(d, 2)} pts
                  </Td>
                </Tr>
              );
            })}
          </tbody>
        </Table>
      </div>
      <p className="text-2xs text-ink/50">
        Shares are of each study&apos;s own total; a source can lose share because another grew. <Badge>linearised</Badge>
      </p>
    </div>
  );
}
