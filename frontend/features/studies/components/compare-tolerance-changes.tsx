import type { ResultFile } from "@shared/schemas/result-file";
import { Panel } from "@frontend/components/ui/panel";
import { Table, THead, Td, Th, Tr } from "@frontend/components/ui/table";
import { sourceChanges } from "../lib/compare";
import { ABLabel } from "./compare-parts";
import { formatNumber } from "@shared/format";

/** The tolerance sources whose width, mean or stage differ between A and B. */
export function TolerancesThatDiffer({ ra, rb }: { ra: ResultFile; rb: ResultFile }) {
  const changes = sourceChanges(ra, rb);
  return (
    <Panel title="Tolerances that differ" meta={changes.length ? `${changes.length} source${changes.length === 1 ? "" : "s"}` : "none"}>
      {changes.length ? (
        <div className="overflow-x-auto rounded-md border border-line/80">
          <Table aria-label="Tolerances that differ">
            <THead>
              <tr>
                <Th>Source</Th>
                <Th align="right">
                  <ABLabel side="a" />±
                </Th>
                <Th align="right">
                  <ABLabel side="b" />±
                </Th>
                <Th align="right">Mean A → B</Th>
                <Th>Stage</Th>
              </tr>
            </THead>
            <tbody>
              {changes.map((c) => {
                const u = c.unit === "um" ? " µm" : "°";
                return (
                  <Tr key={c.id}>
                    <Td className="h-8 font-mono text-xs">{c.id}</Td>
                    <Td numeric className="h-8 text-xs">
                      {c.a ? `${formatNumber(c.a.halfWidth)}${u}` : "absent"}
                    </Td>
                    <Td numeric className="h-8 text-xs font-semibold">
                      {c.b ? `${formatNumber(c.b.halfWidth)}${u}` : "absent"}
                    </Td>
                    <Td numeric className="h-8 text-xs">
                      {c.a ? formatNumber(c.a.mean) : "—"} → {c.b ? formatNumber(c.b.mean) : "—"}
                    </Td>
                    <Td className="h-8 text-xs text-ink/65">
                      {c.a?.stage === c.b?.stage ? c.a?.stage : `${c.a?.stage ?? "—"} → ${c.b?.stage ?? "—"}`}
                    </Td>
                  </Tr>
                );
              })}
            </tbody>
          </Table>
        </div>
      ) : (
        <p className="text-[13px] text-ink/60">Both studies ran the same tolerances; the differences come from the settings above.</p>
      )}
    </Panel>
  );
}
