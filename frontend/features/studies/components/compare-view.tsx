import { useMemo, useState } from "react";
import type { RevisionSummary } from "@shared/schemas/revisions";
import type { ResultFile } from "@shared/schemas/result-file";
import type { StudySummary } from "@shared/schemas/studies";
import { Alert } from "@frontend/components/ui/alert";
import { Badge } from "@frontend/components/ui/badge";
import { Button } from "@frontend/components/ui/button";
import { Select } from "@frontend/components/ui/field";
import { Panel } from "@frontend/components/ui/panel";
import { Table, THead, Td, Th, Tr } from "@frontend/components/ui/table";
import { cn } from "@frontend/lib/cn";
import { useCreateStudy } from "../api/create-study";
import type { StudyDetail } from "../api/get-study";
import {
  changeTone,
  relativeChange,
  requirementComparison,
  settingRows,
  sourceChanges,
  type ChangeTone,
} from "../lib/compare";
import { formatNumber, formatPct, formatPpm, formatYield, formatYieldRange } from "../lib/format";
import { groupMetrics, metricLabel } from "../lib/metrics";
import { PERCENTILES, type PercentileKey } from "../lib/percentiles";
import { SERIES_A, SERIES_B } from "./chart-theme";
import { EnvelopeCharts } from "./envelope-charts";
import { SegmentedControl } from "./segmented-control";
import { StudyCautions } from "./study-cautions";
import { StudyProgress } from "./study-progress";
import { StudyStatusBadge, VerdictBadge } from "./study-status-badge";

const TONE_CLASS: Record<ChangeTone, string> = {
  better: "bg-pass/[0.09] text-pass font-semibold",
  worse: "bg-fail/[0.08] text-fail font-semibold",
  same: "text-ink/55",
};

const signed = (v: number, digits = 3) => `${v > 0 ? "+" : v < 0 ? "−" : "±"}${formatNumber(Math.abs(v), digits)}`;

export function CompareView({
  studies,
  revisions,
  a,
  b,
  onPick,
  canRun,
}: {
  studies: StudySummary[];
  revisions: RevisionSummary[];
  a: StudyDetail | null;
  b: StudyDetail | null;
  onPick: (side: "a" | "b", id: string | null) => void;
  canRun: boolean;
}) {
  const ra = a?.result ?? null;
  const rb = b?.result ?? null;
  return (
    <div className="flex flex-col gap-4">
      <div className="grid gap-3 md:grid-cols-2">
        <SidePicker side="a" colour={SERIES_A} studies={studies} study={a} onPick={(id) => onPick("a", id)} other={b?.id} />
        <SidePicker side="b" colour={SERIES_B} studies={studies} study={b} onPick={(id) => onPick("b", id)} other={a?.id} />
      </div>

      {a && canRun ? <RunElsewhere source={a} revisions={revisions} onStarted={(id) => onPick("b", id)} /> : null}

      {a && b ? (
        <>
          <Panel title="Settings" meta="rows that differ are marked">
            <SettingsTable a={a} b={b} />
          </Panel>
          {ra && rb ? <CompareResults a={a} b={b} ra={ra} rb={rb} /> : <p className="text-[13px] text-ink/60">The comparison fills in when both studies have finished.</p>}
        </>
      ) : (
        <p className="rounded-lg border border-dashed border-line bg-panel px-4 py-6 text-center text-[13px] text-ink/60">
          Choose two studies of this project{a ? ", or run study A's settings on another revision" : ""}.
        </p>
      )}
    </div>
  );
}

function SidePicker({
  side,
  colour,
  studies,
  study,
  onPick,
  other,
}: {
  side: "a" | "b";
  colour: string;
  studies: StudySummary[];
  study: StudyDetail | null;
  onPick: (id: string | null) => void;
  other?: string;
}) {
  const label = side.toUpperCase();
  return (
    <section aria-label={`Study ${label}`} className="rounded-lg border border-line bg-panel px-4 py-3 shadow-[0_1px_2px_rgba(23,33,43,0.04)]">
      <div className="flex items-center gap-3">
        <span className="flex size-6 shrink-0 items-center justify-center rounded text-xs font-extrabold text-white" style={{ background: colour }} aria-hidden="true">
          {label}
        </span>
        <div className="min-w-0 flex-1">
          <Select compact aria-label={`Study ${label}`} value={study?.id ?? ""} onChange={(e) => onPick(e.target.value || null)}>
            <option value="">Choose a study…</option>
            {studies.map((s) => (
              <option key={s.id} value={s.id} disabled={s.id === other}>
                Study {s.number} · rev {s.revisionNumber} · {s.status === "finished" ? (s.passes === null ? "finished" : s.passes ? "pass" : "fail") : s.status}
                {s.label ? ` · ${s.label}` : ""}
              </option>
            ))}
          </Select>
        </div>
        {study ? (study.status === "finished" ? <VerdictBadge passes={study.passes} /> : <StudyStatusBadge status={study.status} />) : null}
      </div>
      {study && (study.status === "queued" || study.status === "running") ? (
        <div className="mt-3">
          <StudyProgress study={study} compact />
        </div>
      ) : null}
      {study && (study.status === "failed" || study.status === "cancelled" || study.status === "interrupted") ? (
        <p className="mt-2 text-xs text-ink/60">This study has no result ({study.status}). Open it to run it again.</p>
      ) : null}
    </section>
  );
}

function RunElsewhere({
  source,
  revisions,
  onStarted,
}: {
  source: StudyDetail;
  revisions: RevisionSummary[];
  onStarted: (id: string) => void;
}) {
  const others = revisions.filter((r) => r.id !== source.revisionId);
  const [target, setTarget] = useState(others[0]?.id ?? "");
  const create = useCreateStudy();
  if (!others.length) return null;
  const rev = others.find((r) => r.id === target);
  return (
    <div className="flex flex-wrap items-center gap-x-3 gap-y-2 rounded-lg border border-line bg-paper/60 px-4 py-2.5">
      <p className="text-xs font-semibold text-ink/80">Same settings on another revision</p>
      <div className="w-auto max-w-[28rem] min-w-0 flex-1">
        <Select compact aria-label="Revision to run on" value={target} onChange={(e) => setTarget(e.target.value)}>
          {others.map((r) => (
            <option key={r.id} value={r.id}>
              Revision {r.number} ({r.status.replace("_", " ")}): {r.name}
            </option>
          ))}
        </Select>
      </div>
      <Button
        size="sm"
        variant="primary"
        pending={create.isPending}
        disabled={!rev}
        onClick={() =>
          create.mutate(
            {
              revisionId: target,
              body: {
                // The frozen file, requirements and seed included, so only the stack differs.
                study: source.study as unknown as Record<string, unknown>,
                ...(source.site ? { site: source.site.site } : {}),
                label: `Settings of study ${source.number} on revision ${rev?.number ?? ""}`,
              },
            },
            { onSuccess: (s) => onStarted(s.id) },
          )
        }
      >
        Run these settings on revision {rev?.number ?? ""}
      </Button>
      <span className="text-2xs text-ink/50">Same seed and requirements as study {source.number}; opens here as study B.</span>
      {create.error ? (
        <Alert className="w-full">
          {create.error.message}
          {"fields" in create.error && Array.isArray(create.error.fields) && create.error.fields.length ? (
            <ul className="mt-1 list-disc pl-4">
              {(create.error.fields as { path: string; message: string }[]).map((f) => (
                <li key={f.path}>
                  <span className="font-mono">{f.path}</span>: {f.message}
                </li>
              ))}
            </ul>
          ) : null}
        </Alert>
      ) : null}
    </div>
  );
}

function SettingsTable({ a, b }: { a: StudyDetail; b: StudyDetail }) {
  const rows = settingRows(
    { study: a.study, site: a.site, revisionNumber: a.revisionNumber, trialsUsed: a.result?.trials },
    { study: b.study, site: b.site, revisionNumber: b.revisionNumber, trialsUsed: b.result?.trials },
  );
  return (
    <div className="overflow-x-auto rounded-md border border-line/80">
      <Table aria-label="Settings compared">
        <THead>
          <tr>
            <Th className="w-40">Setting</Th>
            <Th>
              <ABLabel side="a" /> Study {a.number}
            </Th>
            <Th>
              <ABLabel side="b" /> Study {b.number}
            </Th>
          </tr>
        </THead>
        <tbody>
          {rows.map((r) => (
            <Tr key={r.label} className={r.differs ? "bg-[#fbf3e2] hover:bg-[#f8ecd2]" : undefined}>
              <Td className="h-8 text-xs font-semibold text-ink/70">
                {r.label}
                {r.differs ? <span className="ml-2 text-2xs font-bold text-[#8a5a00]">differs</span> : null}
              </Td>
              <Td className="h-8 text-xs tabular-nums">{r.a}</Td>
              <Td className="h-8 text-xs tabular-nums">{r.b}</Td>
            </Tr>
          ))}
        </tbody>
      </Table>
    </div>
  );
}

function ABLabel({ side }: { side: "a" | "b" }) {
  return (
    <span
      className="mr-1 inline-flex size-4 items-center justify-center rounded-sm align-middle text-[9px] font-extrabold text-white"
      style={{ background: side === "a" ? SERIES_A : SERIES_B }}
      aria-hidden="true"
    >
      {side.toUpperCase()}
    </span>
  );
}

function CompareResults({ a, b, ra, rb }: { a: StudyDetail; b: StudyDetail; ra: ResultFile; rb: ResultFile }) {
  const reqs = requirementComparison(ra, rb);
  const headingReq = ra.requirements.find((r) => r.metric === "heading.maxAbsDeg") ?? rb.requirements.find((r) => r.metric === "heading.maxAbsDeg");
  const changes = sourceChanges(ra, rb);
  return (
    <>
      <StudyCautions />
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
                      <div className="text-2xs font-normal opacity-80">{r.deltaPoints === null ? "" : r.significant ? "beyond sampling error" : "within sampling error"}</div>
                    </Td>
                    <Td numeric className="text-xs">
                      {r.a ? formatPpm(r.a.ppmOut) : "—"}
                    </Td>
                    <Td numeric className="text-xs">
                      {r.b ? formatPpm(r.b.ppmOut) : "—"}
                    </Td>
                    <Td className="text-xs whitespace-nowrap">
                      {r.a ? <VerdictBadge passes={r.a.passes} /> : "—"} <span className="text-ink/40">→</span> {r.b ? <VerdictBadge passes={r.b.passes} /> : "—"}
                    </Td>
                  </Tr>
                );
              })}
            </tbody>
          </Table>
        </div>
      </Panel>

      <Panel title="Key percentiles" meta="of |value|; lower is better">
        <PercentileTable ra={ra} rb={rb} elementOrder={((a.stack.elements ?? []) as { id: string }[]).map((e) => e.id)} />
      </Panel>

      {ra.envelope && rb.envelope ? (
        <Panel title="Heading-error envelopes" meta="A and B overlaid" accent="var(--color-mag)">
          <EnvelopeCharts
            layers={[
              { key: "a", name: `A · study ${a.number}`, colour: SERIES_A, envelope: ra.envelope },
              { key: "b", name: `B · study ${b.number}`, colour: SERIES_B, envelope: rb.envelope },
            ]}
            limitDeg={headingReq?.max}
          />
        </Panel>
      ) : null}

      <div className="grid gap-4 xl:grid-cols-2">
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
                        <Td numeric className="h-8 text-xs">{c.a ? `${formatNumber(c.a.halfWidth)}${u}` : "absent"}</Td>
                        <Td numeric className="h-8 text-xs font-semibold">{c.b ? `${formatNumber(c.b.halfWidth)}${u}` : "absent"}</Td>
                        <Td numeric className="h-8 text-xs">
                          {c.a ? formatNumber(c.a.mean) : "—"} → {c.b ? formatNumber(c.b.mean) : "—"}
                        </Td>
                        <Td className="h-8 text-xs text-ink/65">{c.a?.stage === c.b?.stage ? c.a?.stage : `${c.a?.stage ?? "—"} → ${c.b?.stage ?? "—"}`}</Td>
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
        <Panel title="Top contributors" meta="linearised share of each requirement">
          <TopContributors ra={ra} rb={rb} />
        </Panel>
      </div>
    </>
  );
}

function YieldCell({ r }: { r: ResultFile["requirements"][number] | null }) {
  if (!r) return <>—</>;
  return (
    <>
      <span className={cn("font-semibold", r.passes ? "text-pass" : "text-fail")}>{formatYield(r.predictedYield)}</span>
      <div className="text-2xs text-ink/50">
        {formatYieldRange(r.ci[0], r.ci[1])}
      </div>
    </>
  );
}

function PercentileTable({ ra, rb, elementOrder }: { ra: ResultFile; rb: ResultFile; elementOrder: string[] }) {
  const [scope, setScope] = useState<"requirements" | "changed" | "all">("requirements");
  const [pct, setPct] = useState<PercentileKey>("p9973");
  const all = useMemo(() => groupMetrics([...new Set([...Object.keys(ra.metrics), ...Object.keys(rb.metrics)])], elementOrder).flatMap((g) => g.ids), [ra, rb, elementOrder]);
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
        <SegmentedControl label="Change at percentile" value={pct} onChange={setPct} options={PERCENTILES.map((p) => ({ value: p.key, label: `Δ ${p.label}` }))} />
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
                    {ma && mb ? <span className="ml-1 text-2xs font-normal opacity-75">({signed(mb[pct] - ma[pct], 2)}{unit})</span> : null}
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

function TopContributors({ ra, rb }: { ra: ResultFile; rb: ResultFile }) {
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
                  <Td numeric className="h-8 text-xs">{formatPct(r.a, 3)}</Td>
                  <Td numeric className="h-8 text-xs font-semibold">{formatPct(r.b, 3)}</Td>
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
