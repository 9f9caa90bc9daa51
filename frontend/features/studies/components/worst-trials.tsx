import type { ResultFile } from "@shared/schemas/result-file";
import { Button } from "@frontend/components/ui/button";
import { Table, THead, Td, Th, Tr } from "@frontend/components/ui/table";
import { metricLabel } from "@shared/metrics";
import { MetricSelect } from "./metric-select";
import { formatCount, formatValue } from "@shared/format";

/** The trials with the largest |value| of a metric, each one click from its 3D pose. */
export function WorstTrials({
  result,
  metric,
  onMetric,
  onOpen,
  elementOrder,
}: {
  result: ResultFile;
  metric: string;
  onMetric: (id: string) => void;
  onOpen: (metric: string, trial: number) => void;
  elementOrder: string[];
}) {
  const ids = Object.keys(result.worstTrials).filter((k) => result.worstTrials[k].length > 0);
  const list = result.worstTrials[metric] ?? [];
  const unit = result.metrics[metric]?.unit ?? "deg";
  const req = result.requirements.find((r) => r.metric === metric);
  return (
    <div className="flex flex-col gap-2">
      <MetricSelect
        label="Worst trials of metric"
        ids={ids}
        value={metric}
        onChange={onMetric}
        elementOrder={elementOrder}
        required={result.requirements.map((r) => r.metric)}
        className="w-full"
      />
      <div className="overflow-hidden rounded-md border border-line/80">
        <Table aria-label={`Worst trials of ${metric}`}>
          <THead>
            <tr>
              <Th align="right">#</Th>
              <Th align="right">Trial</Th>
              <Th align="right">Value</Th>
              <Th>
                <span className="sr-only">Open</span>
              </Th>
            </tr>
          </THead>
          <tbody>
            {list.map((w, i) => (
              <Tr key={w.trial}>
                <Td numeric className="h-9 w-8 text-xs text-ink/50">
                  {i + 1}
                </Td>
                <Td numeric className="h-9 text-xs font-semibold">
                  {formatCount(w.trial)}
                </Td>
                <Td numeric className={`h-9 text-xs ${req && Math.abs(w.value) > req.max ? "font-semibold text-fail" : ""}`}>
                  {formatValue(w.value, unit)}
                </Td>
                <Td className="h-9 w-0 pr-2 text-right">
                  <Button size="sm" variant="secondary" onClick={() => onOpen(metric, w.trial)} aria-label={`Open trial ${w.trial} in 3D`}>
                    Open in 3D
                  </Button>
                </Td>
              </Tr>
            ))}
          </tbody>
        </Table>
        {list.length === 0 ? <p className="px-3 py-4 text-center text-xs text-ink/55">No trials kept for {metricLabel(metric)}.</p> : null}
      </div>
      <p className="text-2xs text-ink/50">
        Trial numbers count from 0; the pose is regenerated from seed {result.seed}, so it is exactly the trial sampled.
      </p>
    </div>
  );
}
