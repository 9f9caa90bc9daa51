import type { ReportContent } from "@shared/schemas/reports";
import { Badge } from "@frontend/components/ui/badge";
import { Table, Td, Th, THead, Tr } from "@frontend/components/ui/table";
import { formatFraction, formatIndex, formatNumber, formatNumberUnit, formatShare, formatWritten, formatYieldRange } from "@shared/format";
import { distLabel } from "@shared/reports/format";

/** The supplier's tolerances with the capability asked, as in section 1 of the PDF. */
export function TolerancesTable({ content }: { content: ReportContent }) {
  const raised = content.tolerances.some((t) => t.raised);
  return (
    <>
      <div className="overflow-x-auto">
        <Table aria-label="Tolerances">
          <THead>
            <tr>
              <Th>Source</Th>
              <Th>Quantity</Th>
              <Th align="right">Tolerance</Th>
              <Th>Distribution</Th>
              <Th>Stage</Th>
              <Th align="right">Cpk ≥</Th>
              <Th align="right">
                <span className="normal-case">σ</span> max
              </Th>
              <Th align="right">
                <span className="normal-case">σ</span> modelled
              </Th>
            </tr>
          </THead>
          <tbody>
            {content.tolerances.map((t) => (
              <Tr key={t.source}>
                <Td className="font-bold whitespace-nowrap text-ink" title={`${t.elementName} (${t.elementKind})`}>
                  {t.source}
                </Td>
                <Td className="min-w-[150px] py-1.5 text-xs leading-4 text-ink/60">{t.quantity}</Td>
                <Td numeric className="font-semibold">
                  {formatWritten(t.tol, t.unit, "±")}
                  {t.mean ? (
                    <span className="block text-2xs font-normal text-ink/55">
                      target {t.mean > 0 ? "+" : ""}
                      {formatWritten(t.mean, t.unit)}
                    </span>
                  ) : null}
                </Td>
                <Td className="whitespace-nowrap text-ink/75">{distLabel(t.dist, t.sigmas)}</Td>
                <Td className="text-ink/75">{t.stage}</Td>
                <Td numeric className="font-bold text-mag">
                  {formatIndex(t.cpk)}
                  {t.raised ? <sup title="raised to what the study assumed">*</sup> : null}
                </Td>
                <Td numeric className="font-semibold">
                  {formatNumberUnit(t.sigmaMax, t.unit)}
                </Td>
                <Td numeric className="text-ink/60">
                  {formatNumberUnit(t.sigmaModelled, t.unit)}
                </Td>
              </Tr>
            ))}
          </tbody>
        </Table>
      </div>
      <p className="border-t border-line px-4 py-2.5 text-xs text-ink/55">
        Cpk = min(USL − x̄, x̄ − LSL) / 3s on production parts, with the window target ± tolerance. σ max is the largest spread of a centred
        process that meets it.
        {raised ? " * Raised to the capability the study assumed for this source." : ""}
      </p>
    </>
  );
}

/** The study's requirements with their predicted yields and this supplier's share of each. */
export function RequirementsTable({ content }: { content: ReportContent }) {
  return (
    <div className="overflow-x-auto">
      <Table aria-label="Requirements">
        <THead>
          <tr>
            <Th className="w-10">#</Th>
            <Th>Requirement</Th>
            <Th align="right">Limit</Th>
            <Th align="right">Target</Th>
            <Th align="right">Predicted yield</Th>
            <Th>Result</Th>
            <Th align="right">Your share</Th>
          </tr>
        </THead>
        <tbody>
          {content.requirements.map((r, i) => (
            <Tr key={r.metric} className={r.fed ? undefined : "text-ink/55"}>
              <Td className={r.fed ? "font-bold text-mag" : "font-bold text-ink/40"}>R{i + 1}</Td>
              <Td className="py-2">
                <p className="font-semibold">{r.description}</p>
                <p className="text-xs text-ink/50">{r.metric}</p>
              </Td>
              <Td numeric>
                ≤ {formatNumber(r.max, 3)}
                {r.unit === "%" ? " %" : "°"}
              </Td>
              <Td numeric>{formatFraction(r.yield)}</Td>
              <Td numeric>
                <span className="font-semibold">{formatFraction(r.predictedYield)}</span>
                <span className="block text-2xs text-ink/50">{formatYieldRange(r.ci[0], r.ci[1])}</span>
              </Td>
              <Td>
                <Badge tone={r.passes ? "pass" : "fail"}>{r.passes ? "Pass" : "Fail"}</Badge>
              </Td>
              <Td numeric>
                {r.supplierShare === null ? (
                  "—"
                ) : (
                  <span className="inline-flex items-center justify-end gap-2">
                    <span className="h-1.5 w-16 overflow-hidden rounded-full bg-line/70" aria-hidden="true">
                      <span className="block h-full rounded-full bg-mag" style={{ width: `${Math.min(100, r.supplierShare * 100)}%` }} />
                    </span>
                    <span className={r.fed ? "font-bold" : undefined}>{formatShare(r.supplierShare)}</span>
                  </span>
                )}
              </Td>
            </Tr>
          ))}
        </tbody>
      </Table>
    </div>
  );
}
