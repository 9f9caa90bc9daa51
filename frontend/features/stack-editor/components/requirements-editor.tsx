/**
 * The revision's requirements: a metric the stack offers (from the engine's metric ids),
 * an upper limit on its absolute value in the metric's unit, and a yield target; beside
 * each, the live estimate's predicted yield.
 */
import { useMemo } from "react";
import type { Requirement } from "@shared/schemas/study-file";
import { Badge } from "@frontend/components/ui/badge";
import { Button, IconButton } from "@frontend/components/ui/button";
import { PlusIcon, TrashIcon } from "@frontend/components/ui/icons";
import { cn } from "@frontend/lib/cn";
import { sentence } from "@frontend/lib/form";
import { fieldError } from "../lib/issues";
import type { EstimateSummary } from "../lib/live-estimate";
import { metricLabel, metricUnit } from "@shared/metrics";
import { metricOptions } from "../lib/metrics";
import { useEditor } from "./editor-context";
import { NumberInput, SelectInput } from "./fields";
import { YieldInput } from "./yield-input";
import { formatMrad, formatPpm, formatShare, formatYield, formatYieldRange, unitText } from "@shared/format";

export function RequirementsEditor({ estimate, estimateStale }: { estimate: EstimateSummary | null; estimateStale: boolean }) {
  const { doc, issues, readOnly, setAt, update } = useEditor();
  const groups = useMemo(() => metricOptions(doc.stack), [doc.stack]);
  const options = useMemo(() => groups.flatMap((g) => g.options), [groups]);
  const known = new Set(options.map((o) => o.id));
  const reqs = doc.requirements;

  const addRequirement = () => {
    const used = new Set(reqs.map((r) => r.metric));
    const first =
      options.find((o) => !used.has(o.id) && o.id === "heading.maxAbsDeg") ?? options.find((o) => !used.has(o.id)) ?? options[0];
    const next: Requirement = { metric: first?.id ?? "", max: first?.unit === "%" ? 2 : 1, yield: 0.9973 };
    update((d) => ({ ...d, requirements: [...d.requirements, next] }));
  };

  return (
    <div>
      <table className="w-full table-fixed border-collapse text-xs" aria-label="Requirements">
        <thead className="border-b border-line bg-paper/70">
          <tr className="text-[10.5px] font-bold tracking-[0.06em] text-ink/55 uppercase">
            <th className="h-8 w-[31%] px-3 text-left">Metric</th>
            <th className="w-[14%] px-2 text-right" title="Upper limit on the absolute value">
              Limit
            </th>
            <th className="w-[20%] px-2 text-right" title="In %: 99.73 means 99.73 % of units within the limit">
              Yield target (%)
            </th>
            <th className="w-[29%] px-2 text-right">Estimate</th>
            <th className="w-[6%]" />
          </tr>
        </thead>
        <tbody>
          {reqs.length === 0 ? (
            <tr>
              <td colSpan={5} className="px-3 py-5 text-center text-[13px] text-ink/55">
                No requirements yet: add the system team's limits (heading error, cross-axis, relative rotation) with their yield targets.
              </td>
            </tr>
          ) : null}
          {reqs.map((r, i) => {
            const list = issues.requirements.get(i);
            const unit = metricUnit(r.metric);
            const est = estimate?.requirements.find((x) => x.index === i) ?? null;
            const messages = (list ?? []).map((x) => x.message);
            const label = r.metric ? metricLabel(r.metric) : `requirement ${i + 1}`;
            return (
              <tr key={i} className="border-b border-line/60 align-top">
                <td className="px-3 py-1.5">
                  <SelectInput
                    aria-label={`Requirement ${i + 1} metric`}
                    value={r.metric}
                    disabled={readOnly}
                    invalid={!!fieldError(list, "metric")}
                    onChange={(e) => setAt(["requirements", i, "metric"], e.target.value)}
                  >
                    {!known.has(r.metric) ? <option value={r.metric}>{r.metric || "Choose a metric"} (not in this stack)</option> : null}
                    {groups.map((g) => (
                      <optgroup key={g.group} label={g.group}>
                        {g.options.map((o) => (
                          <option key={o.id} value={o.id}>
                            {o.label}
                          </option>
                        ))}
                      </optgroup>
                    ))}
                  </SelectInput>
                  <p className="mt-0.5 font-mono text-[10.5px] break-all text-ink/45">{r.metric}</p>
                  {messages.length ? (
                    <p className="mt-0.5 text-[11px] font-medium text-fail">{messages.map(sentence).join(" · ")}</p>
                  ) : null}
                </td>
                <td className="px-2 py-1.5">
                  <NumberInput
                    aria-label={`Requirement ${i + 1} limit`}
                    unit={unitText(unit)}
                    value={r.max}
                    disabled={readOnly}
                    invalid={!!fieldError(list, "max")}
                    onChange={(v) => setAt(["requirements", i, "max"], v, `req:${i}:max`)}
                  />
                  {unit === "deg" && Number.isFinite(r.max) ? (
                    <p className="num mt-0.5 text-[10.5px] text-ink/45">{formatMrad(r.max)}</p>
                  ) : null}
                </td>
                <td className="px-2 py-1.5">
                  <YieldInput
                    aria-label={`Requirement ${i + 1} yield target`}
                    value={r.yield}
                    disabled={readOnly}
                    invalid={!!fieldError(list, "yield")}
                    onChange={(v) => setAt(["requirements", i, "yield"], v, `req:${i}:yield`)}
                  />
                  {Number.isFinite(r.yield) && r.yield > 0 && r.yield < 1 ? (
                    <p className="num mt-0.5 text-[10.5px] text-ink/45">{formatPpm((1 - r.yield) * 1e6)} out</p>
                  ) : null}
                </td>
                <td className="px-2 py-1.5 text-right">
                  {est ? (
                    <div
                      className={cn("inline-flex max-w-full flex-col items-end", estimateStale && "opacity-50")}
                      aria-label={`Estimate for ${label}`}
                    >
                      <span className="inline-flex items-center gap-1.5">
                        <span className={cn("num text-[13px] font-bold", est.passes ? "text-pass" : "text-fail")}>
                          {formatYield(est.predictedYield)}
                        </span>
                        <Badge tone={est.passes ? "pass" : "fail"}>{est.passes ? "Meets" : "Misses"}</Badge>
                      </span>
                      <span className="num text-[10.5px] text-ink/45">95 % CI {formatYieldRange(est.ci[0], est.ci[1])}</span>
                      {est.drivers.length ? (
                        <span
                          className="mt-0.5 max-w-full text-right text-[10.5px] text-ink/55"
                          title="Largest linearised contributors: share of the metric's variance (or mean square)"
                        >
                          driven by{" "}
                          {est.drivers.slice(0, 2).map((d, k) => (
                            <span key={d.source}>
                              {k > 0 ? " · " : ""}
                              <span className="font-mono text-ink/75">{d.source}</span> <span className="num">{formatShare(d.share)}</span>
                            </span>
                          ))}
                        </span>
                      ) : null}
                    </div>
                  ) : (
                    <span className="text-[11px] text-ink/40">{messages.length ? "fix to estimate" : "—"}</span>
                  )}
                </td>
                <td className="px-1 py-1.5 text-right">
                  {readOnly ? null : (
                    <IconButton
                      label={`Remove requirement ${i + 1}`}
                      variant="danger-ghost"
                      onClick={() => update((d) => ({ ...d, requirements: d.requirements.filter((_, k) => k !== i) }))}
                    >
                      <TrashIcon />
                    </IconButton>
                  )}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
      {readOnly ? null : (
        <div className="border-t border-line px-3 py-2">
          <Button size="sm" icon={<PlusIcon />} onClick={addRequirement} disabled={options.length === 0}>
            Add requirement
          </Button>
          {options.length === 0 ? (
            <span className="ml-2 text-[11px] text-ink/50">Add an element on the board first: its metrics become available.</span>
          ) : null}
        </div>
      )}
    </div>
  );
}
