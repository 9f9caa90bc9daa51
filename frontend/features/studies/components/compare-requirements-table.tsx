import type { ResultFile } from "@shared/schemas/result-file";
import { Panel } from "@frontend/components/ui/panel";
import { Table, THead, Td, Th, Tr } from "@frontend/components/ui/table";
import { cn } from "@frontend/lib/cn";
import { requirementComparison, type ChangeTone } from "../lib/compare";
import { metricLabel } from "@shared/metrics";
import { ABLabel, signed, TONE_CLASS } from "./compare-parts";
import { VerdictBadge } from "./study-status-badge";
import { formatNumber, formatPpm, formatYield, formatYieldRange } from "@shared/format";

/** Each requirement's predicted yield in A and B, the change and whether it is beyond sampling error. */
export function RequirementsCompared({ ra, rb }: { ra: ResultFile; rb: ResultFile }) {
  const reqs = requirementComparison(ra, rb);
  return (
    <Panel title="Requirements" meta="predicted yield A → B; changes beyond sampling error marked">
      <div className="overflow-x-auto rounded-md border border-line/80">
        <Table aria-label="Requirements compared">
          <THead>
            <tr>
              <Th>Requirement</Th>
              <Th align="right">Target</Th>
              <Th align="right">
                <ABLabel side="a" />
                Yield
              </Th>
              <Th align="right">
                <ABLabel side="b" />
                Yield
              </Th>
              <Th align="right">Change</Th>
              <Th align="right">
                <ABLabel side="a" />
                ppm out
              </Th>
              <Th align="right">
                <ABLabel side="b" />
                ppm out
              </Th>
              <Th>Verdict</Th>
            </tr>
          </THead>
          <tbody>
            {reqs.map((r) => {
              const tone: ChangeTone = r.deltaPoints === null || !r.significant ? "same" : r.deltaPoints > 0 ? "better" : "worse";
              return (
                <Tr key={r.metric} className={r.verdictChanged ? "bg-[#fbf3e2] hover:bg-[#f8ecd2]" : undefined}>
                  <Td className="h-11 text-xs">
                    <div className="font-semibold">{metricLabel(r.metric)}</div>
                    <div className="font-mono text-2xs text-ink/45">
                      {r.metric} ≤ {formatNumber(r.max)}
                      {ra.metrics[r.metric]?.unit === "%" ? " %" : "°"}
                    </div>
                  </Td>
                  <Td numeric className="text-xs">
                    {formatYield(r.target)}
                  </Td>
                  <Td numeric className="text-xs">
                    <YieldCell r={r.a} />
                  </Td>
                  <Td numeric className="text-xs">
                    <YieldCell r={r.b} />
                  </Td>
                  <Td numeric className={cn("text-xs", TONE_CLASS[tone])}>
                    {r.deltaPoints === null ? "—" : `${signed(r.deltaPoints, 3)} pts`}
                    <div className="text-2xs font-normal opacity-80">
                      {r.deltaPoints === null ? "" : r.significant ? "beyond sampling error" : "within sampling error"}
                    </div>
                  </Td>
                  <Td numeric className="text-xs">
                    {r.a ? formatPpm(r.a.ppmOut) : "—"}
                  </Td>
                  <Td numeric className="text-xs">
                    {r.b ? formatPpm(r.b.ppmOut) : "—"}
                  </Td>
                  <Td className="text-xs whitespace-nowrap">
                    {r.a ? <VerdictBadge passes={r.a.passes} /> : "—"} <span className="text-ink/40">→</span>{" "}
                    {r.b ? <VerdictBadge passes={r.b.passes} /> : "—"}
                  </Td>
                </Tr>
              );
            })}
          </tbody>
        </Table>
      </div>
    </Panel>
  );
}

function YieldCell({ r }: { r: ResultFile["requirements"][number] | null }) {
  if (!r) return <>—</>;
  return (
    <>
      <span className={cn("font-semibold", r.passes ? "text-pass" : "text-fail")}>{formatYield(r.predictedYield)}</span>
      <div className="text-2xs text-ink/50">{formatYieldRange(r.ci[0], r.ci[1])}</div>
    </>
  );
}
