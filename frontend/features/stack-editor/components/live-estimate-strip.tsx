/**
 * The headline figures of the live estimate: heading error, the worst cross-axis and
 * relative rotation, and each requirement's predicted yield against its target. Clearly
 * an estimate: few trials, fixed seed, an assumed field inclination.
 */
import type { ReactNode } from "react";
import { Badge } from "@frontend/components/ui/badge";
import { Spinner } from "@frontend/components/ui/spinner";
import { cn } from "@frontend/lib/cn";
import type { EstimateState } from "../hooks/use-live-estimate";
import { LIVE_INCLINATION_DEG, LIVE_TRIALS } from "../lib/live-estimate";
import { metricLabel } from "@shared/metrics";
import { formatCount, formatMrad, formatNumber, formatYield } from "@shared/format";

function Figure({
  label,
  value,
  unit,
  sub,
  title,
  testId,
}: {
  label: string;
  value: string;
  unit: string;
  sub?: ReactNode;
  title?: string;
  testId?: string;
}) {
  return (
    <div className="min-w-0 px-4 py-2.5" title={title}>
      <p className="text-[10.5px] font-bold tracking-[0.08em] text-ink/50 uppercase">{label}</p>
      <p className={cn("mt-0.5 flex items-baseline whitespace-nowrap", unit === "°" ? "gap-0" : "gap-1")}>
        <span className="num text-[20px] leading-6 font-extrabold tracking-[-0.01em] text-ink" data-testid={testId}>
          {value}
        </span>
        <span className="text-[13px] font-bold text-ink/55">{unit}</span>
      </p>
      {sub ? <p className="mt-0.5 text-[11px] break-all text-ink/55">{sub}</p> : null}
    </div>
  );
}

export function LiveEstimateStrip({ estimate, problems }: { estimate: EstimateState; problems: number }) {
  const { summary, status, stale } = estimate;
  const updating = status === "waiting" || status === "running";
  const pass = summary?.requirements.filter((r) => r.passes).length ?? 0;
  const total = summary?.requirements.length ?? 0;

  const statusText =
    status === "paused"
      ? `Paused: fix ${problems} problem${problems === 1 ? "" : "s"} to update`
      : status === "error"
        ? `Could not run: ${estimate.error}`
        : status === "unavailable"
          ? "Not available in this browser"
          : updating
            ? "Updating…"
            : estimate.ms !== null
              ? `Updated in ${estimate.ms < 1000 ? `${Math.max(1, Math.round(estimate.ms))} ms` : `${(estimate.ms / 1000).toFixed(1)} s`}`
              : "";

  return (
    <section
      aria-label="Live estimate"
      aria-busy={updating || undefined}
      className="rounded-lg border border-line bg-panel shadow-[0_1px_2px_rgba(23,33,43,0.04)]"
    >
      <header className="flex flex-wrap items-center gap-x-3 gap-y-1 border-b border-line px-4 py-1.5">
        <h2 className="text-[13px] font-bold text-ink">Live estimate</h2>
        <Badge tone="gyro">Estimate · {formatCount(LIVE_TRIALS)} trials</Badge>
        <span className="text-[11px] text-ink/50">
          fixed seed · field inclination {LIVE_INCLINATION_DEG}° assumed · no calibration · run a study for figures to report
        </span>
        <span
          className={cn(
            "ml-auto inline-flex items-center gap-1.5 text-[11px] font-semibold",
            status === "error" || status === "paused" ? "text-[#a1461f]" : "text-ink/55",
          )}
          role="status"
          data-testid="estimate-status"
        >
          {updating ? <Spinner size={11} /> : null}
          {statusText}
        </span>
      </header>
      {summary ? (
        <div
          className={cn(
            "grid grid-cols-[repeat(3,minmax(0,1fr))_minmax(0,1.5fr)] divide-x divide-line transition-opacity",
            stale && "opacity-55",
          )}
        >
          {summary.heading ? (
            <Figure
              label="Heading error · p99"
              value={formatNumber(summary.heading.p99)}
              unit="°"
              testId="estimate-heading-p99"
              sub={
                <>
                  <span className="num">{formatMrad(summary.heading.p99)}</span> · p95{" "}
                  <span className="num">{formatNumber(summary.heading.p95)}°</span> · max{" "}
                  <span className="num">{formatNumber(summary.heading.max)}°</span>
                </>
              }
              title="heading.maxAbsDeg: the largest heading error over the attitude sweep, 99th percentile over the trials"
            />
          ) : (
            <Figure label="Heading error" value="—" unit="" sub="needs an accelerometer and a magnetometer" />
          )}
          {summary.worstCrossAxis ? (
            <Figure
              label="Worst cross-axis · p99"
              value={formatNumber(summary.worstCrossAxis.p99)}
              unit="%"
              testId="estimate-cross-axis-p99"
              sub={<span className="font-mono text-[10.5px]">{summary.worstCrossAxis.metric}</span>}
              title={metricLabel(summary.worstCrossAxis.metric)}
            />
          ) : (
            <Figure label="Worst cross-axis" value="—" unit="" sub="no sensor die yet" />
          )}
          {summary.worstRelRot ? (
            <Figure
              label="Relative rotation · p99"
              value={formatNumber(summary.worstRelRot.p99)}
              unit="°"
              sub={<span className="font-mono text-[10.5px]">{summary.worstRelRot.metric}</span>}
              title={metricLabel(summary.worstRelRot.metric)}
            />
          ) : (
            <Figure label="Relative rotation" value="—" unit="" sub="needs two sensor dies" />
          )}
          <div className="min-w-0 px-4 py-2.5">
            <p className="flex items-center gap-2 text-[10.5px] font-bold tracking-[0.08em] text-ink/50 uppercase">
              Requirements
              {total ? (
                <span className={cn("tracking-normal normal-case", pass === total ? "text-pass" : "text-fail")}>
                  {pass} of {total} meet their target
                </span>
              ) : null}
            </p>
            {total ? (
              <ul
                className={cn("mt-1 grid gap-x-4 gap-y-0.5", summary.requirements.length > 4 ? "grid-cols-2" : "grid-cols-1")}
                aria-label="Predicted yield per requirement"
              >
                {summary.requirements.map((r) => (
                  <li key={r.index} className="flex min-w-0 items-center gap-1.5 text-[11px]">
                    <span className={cn("size-1.5 shrink-0 rounded-full", r.passes ? "bg-pass" : "bg-fail")} aria-hidden="true" />
                    <span className="min-w-0 flex-1 font-mono text-[10.5px] break-all text-ink/70" title={metricLabel(r.metric)}>
                      {r.metric}
                    </span>
                    <span className={cn("num font-bold", r.passes ? "text-pass" : "text-fail")}>{formatYield(r.predictedYield)}</span>
                    <span className="num text-ink/45">/ {formatYield(r.yield)}</span>
                    <span className="sr-only">{r.passes ? "meets" : "misses"} the target</span>
                  </li>
                ))}
              </ul>
            ) : (
              <p className="mt-1 text-[11px] text-ink/50">None yet: add requirements below to see their predicted yield.</p>
            )}
          </div>
        </div>
      ) : (
        <div className="flex h-[68px] items-center gap-2 px-4 text-[13px] text-ink/55">
          {updating ? (
            <>
              <Spinner /> Estimating {formatCount(LIVE_TRIALS)} trials…
            </>
          ) : status === "paused" ? (
            `The estimate runs once the stack is valid: ${problems} problem${problems === 1 ? "" : "s"} to fix.`
          ) : (
            statusText
          )}
        </div>
      )}
    </section>
  );
}
