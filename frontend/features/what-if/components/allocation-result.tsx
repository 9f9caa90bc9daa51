import type { Allocation } from "@shared/schemas/what-if";
import { metricLabel } from "@shared/metrics";
import { formatNumberUnit, formatYield, formatYieldRange } from "@shared/format";
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { Table, TableFrame, Td, Th, THead, Tr } from "@frontend/components/ui/table";
import { cn } from "@frontend/lib/cn";

const money = (v: number) => v.toFixed(3);

/** Current against proposed tolerances with what each change costs or saves, and the verified yields. */
export function AllocationResult({
  allocation,
  canApply,
  applying,
  onApply,
}: {
  allocation: Allocation;
  canApply: boolean;
  applying: boolean;
  onApply: () => void;
}) {
  const a = allocation;
  const delta = (a.totalCostProposed ?? 0) - (a.totalCostCurrent ?? 0);
  return (
    <div className="flex flex-col gap-4">
      <Alert tone={a.verified ? "info" : undefined} title={a.verified ? "Verified by Monte Carlo" : "Not verified"}>
        {a.message}
      </Alert>
      <TableFrame>
        <Table aria-label="Current and proposed tolerances">
          <THead>
            <tr>
              <Th>Source</Th>
              <Th align="right">Today ±T</Th>
              <Th align="right">Proposed ±T</Th>
              <Th align="right">Cost today</Th>
              <Th align="right">Cost proposed</Th>
              <Th align="right">Change</Th>
            </tr>
          </THead>
          <tbody>
            {a.sources.map((s) => {
              const d = s.costProposed - s.costCurrent;
              const moved = s.proposed !== s.current;
              return (
                <Tr key={s.source} className={moved ? "" : "text-ink/55"}>
                  <Td>
                    <span className="font-semibold">{s.source}</span>
                    {!s.free ? <span className="ml-1.5 text-ink/50">held</span> : null}
                    {s.atBound ? <span className="ml-1.5 text-warn">at its {s.atBound === "min" ? "lowest" : "highest"} bound</span> : null}
                  </Td>
                  <Td numeric>{formatNumberUnit(s.current, s.unit, 4)}</Td>
                  <Td numeric className={cn(moved && (s.proposed < s.current ? "font-bold text-fail" : "font-bold text-pass"))}>
                    {formatNumberUnit(s.proposed, s.unit, 4)}
                  </Td>
                  <Td numeric>{money(s.costCurrent)}</Td>
                  <Td numeric>{money(s.costProposed)}</Td>
                  <Td numeric className={d > 1e-12 ? "text-fail" : d < -1e-12 ? "text-pass" : ""}>
                    {Math.abs(d) < 1e-12 ? "—" : `${d > 0 ? "+" : "−"}${money(Math.abs(d))}`}
                  </Td>
                </Tr>
              );
            })}
            <Tr>
              <Td className="font-bold">Total</Td>
              <Td />
              <Td />
              <Td numeric className="font-bold">
                {money(a.totalCostCurrent ?? 0)}
              </Td>
              <Td numeric className="font-bold">
                {money(a.totalCostProposed ?? 0)}
              </Td>
              <Td numeric className={cn("font-bold", delta > 0 ? "text-fail" : "text-pass")} data-testid="cost-change">
                {`${delta > 0 ? "+" : "−"}${money(Math.abs(delta))} (${delta > 0 ? "costs more" : "saves"})`}
              </Td>
            </Tr>
          </tbody>
        </Table>
      </TableFrame>
      <TableFrame>
        <Table aria-label="Requirements today and with the proposal">
          <THead>
            <tr>
              <Th>Requirement</Th>
              <Th align="right">Target</Th>
              <Th align="right">Today</Th>
              <Th align="right">Proposed (95 % interval)</Th>
              <Th>Shown</Th>
            </tr>
          </THead>
          <tbody>
            {a.requirements.map((r) => (
              <Tr key={r.metric}>
                <Td>
                  {metricLabel(r.metric)} ≤ {r.max}
                </Td>
                <Td numeric>{formatYield(r.yield)}</Td>
                <Td numeric className={r.current.passes ? "text-pass" : "text-fail"}>
                  {formatYield(r.current.predictedYield)}
                </Td>
                <Td numeric>
                  {formatYield(r.predictedYield)} ({formatYieldRange(r.ci[0], r.ci[1])})
                </Td>
                <Td className={r.demonstrated ? "font-semibold text-pass" : "font-semibold text-fail"}>
                  {r.demonstrated ? "yes, by the interval's lower end" : "no"}
                </Td>
              </Tr>
            ))}
          </tbody>
        </Table>
      </TableFrame>
      <p className="text-xs text-ink/55">{a.method}</p>
      {canApply && a.verified ? (
        <div>
          <Button variant="primary" pending={applying} disabled={!!a.appliedRevisionId} onClick={onApply}>
            {a.appliedRevisionId ? "A draft was made from this" : "Create a draft from this"}
          </Button>
        </div>
      ) : null}
    </div>
  );
}
