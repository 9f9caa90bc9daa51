import { useMemo, useState } from "react";
import type { ResultFile } from "@shared/schemas/result-file";
import { Table, THead, Td, Th, Tr } from "@frontend/components/ui/table";
import { cn } from "@frontend/lib/cn";
import { changeTone, relativeChange } from "../lib/compare";
import { groupMetrics, metricLabel } from "@shared/metrics";
import { PERCENTILES, type PercentileKey } from "../lib/percentiles";
import { signed, TONE_CLASS } from "./compare-parts";
import { SegmentedControl } from "./segmented-control";
import { formatNumber } from "@shared/format";

/** Key percentiles of A and B per metric, with the relative change at a chosen percentile. */
export function PercentileTable({ ra, rb, elementOrder }: { ra: ResultFile; rb: ResultFile; elementOrder: string[] }) {
  const [scope, setScope] = useState<"requirements" | "changed" | "all">("requirements");
  const [pct, setPct] = useState<PercentileKey>("p9973");
  const all = useMemo(
    () => groupMetrics([...new Set([...Object.keys(ra.metrics), ...Object.keys(rb.metrics)])], elementOrder).flatMap((g) => g.ids),
    [ra, rb, elementOrder],
  );
  const reqIds = [...new Set([...ra.requirements.map((r) => r.metric), ...rb.requirements.map((r) => r.metric)])];
  const ids =
    scope === "requirements"
      ? reqIds
      : scope === "changed"
        ? all.filter((id) => changeTone(relativeChange(ra.metrics[id]?.[pct], rb.metrics[id]?.[pct])) !== "same")
        : all;
  return (
    <div className="flex flex-col gap-2">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <SegmentedControl
          label="Metrics shown"
          value={scope}
          onChange={setScope}
          options={[
            { value: "requirements", label: "Requirement metrics" },
            { value: "changed", label: "Changed by 5 % or more" },
            { value: "all", label: "All metrics" },
          ]}
        />
        <SegmentedControl
          label="Change at percentile"
          value={pct}
          onChange={setPct}
          options={PERCENTILES.map((p) => ({ value: p.key, label: `Δ ${p.label}` }))}
        />
      </div>
      <div className="max-h-[480px] overflow-auto rounded-md border border-line/80">
        <Table aria-label="Percentiles compared">
          <THead className="sticky top-0 bg-paper">
            <tr>
              <Th>Metric</Th>
              {PERCENTILES.map((p) => (
                <Th key={p.key} align="right" colSpan={2} className={p.key === pct ? "text-ink" : undefined}>
                  {p.label} A · B
                </Th>
              ))}
              <Th align="right">Δ {PERCENTILES.find((p) => p.key === pct)!.label}</Th>
            </tr>
          </THead>
          <tbody>
            {ids.map((id) => {
              const ma = ra.metrics[id];
              const mb = rb.metrics[id];
              const rel = relativeChange(ma?.[pct], mb?.[pct]);
              const tone = changeTone(rel);
              const unit = (ma ?? mb)?.unit === "%" ? " %" : "°";
              return (
                <Tr key={id}>
                  <Td className="h-8 text-xs">
                    <span className="font-semibold">{metricLabel(id)}</span>
                    <span className="ml-2 font-mono text-2xs text-ink/45">{id}</span>
                  </Td>
                  {PERCENTILES.map((p) => (
                    <PairCells key={p.key} a={ma?.[p.key]} b={mb?.[p.key]} emphasised={p.key === pct} />
                  ))}
                  <Td numeric className={cn("h-8 text-xs", TONE_CLASS[tone])}>
                    {rel === null ? "—" : `${signed(rel, 2)} %`}
                    {ma && mb ? (
                      <span className="ml-1 text-2xs font-normal opacity-75">
                        ({signed(mb[pct] - ma[pct], 2)}
                        {unit})
                      </span>
                    ) : null}
                  </Td>
                </Tr>
              );
            })}
            {ids.length === 0 ? (
              <tr>
                <td colSpan={10} className="px-3 py-4 text-center text-xs text-ink/55">
                  No metric moved by 5 % or more at this percentile.
                </td>
              </tr>
            ) : null}
          </tbody>
        </Table>
      </div>
    </div>
  );
}

function PairCells({ a, b, emphasised }: { a?: number; b?: number; emphasised: boolean }) {
  return (
    <>
      <Td numeric className={cn("h-8 pr-1 text-xs", emphasised ? "text-ink" : "text-ink/60")}>
        {a === undefined ? "—" : formatNumber(a)}
      </Td>
      <Td numeric className={cn("h-8 pl-1 text-xs", emphasised ? "font-semibold text-ink" : "text-ink/60")}>
        {b === undefined ? "—" : formatNumber(b)}
      </Td>
    </>
  );
}
