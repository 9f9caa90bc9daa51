import type { ResultFile } from "@shared/schemas/result-file";
import { Badge } from "@frontend/components/ui/badge";
import { cn } from "@frontend/lib/cn";
import { metricLabel } from "@shared/metrics";
import { formatCount, formatDeg, formatMrad, formatPct, formatPpm, formatYield, formatYieldRange } from "@shared/format";

type Requirement = ResultFile["requirements"][number];

/** One card per requirement: the verdict, the predicted yield with its interval, the ppm out. */
export function RequirementCards({
  result,
  selected,
  onSelect,
}: {
  result: ResultFile;
  selected: string | null;
  onSelect: (metric: string) => void;
}) {
  if (result.requirements.length === 0) {
    return (
      <p className="rounded-lg border border-dashed border-line bg-panel px-4 py-3 text-[13px] text-ink/60">
        This study has no requirements, so there is no verdict: the figures below describe the stack as modelled.
      </p>
    );
  }
  return (
    <ul aria-label="Requirements" className="grid gap-3 sm:grid-cols-2 xl:grid-cols-4">
      {result.requirements.map((r) => (
        <li key={r.metric}>
          <RequirementCard
            requirement={r}
            unit={result.metrics[r.metric]?.unit ?? "deg"}
            trials={result.trials}
            selected={selected === r.metric}
            onSelect={() => onSelect(r.metric)}
          />
        </li>
      ))}
    </ul>
  );
}

function Limit({ value, unit }: { value: number; unit: "deg" | "%" }) {
  return unit === "%" ? (
    <span className="tabular-nums">{formatPct(value)}</span>
  ) : (
    <span className="tabular-nums">
      {formatDeg(value)} <span className="text-ink/50">({formatMrad(value)})</span>
    </span>
  );
}

function RequirementCard({
  requirement: r,
  unit,
  trials,
  selected,
  onSelect,
}: {
  requirement: Requirement;
  unit: "deg" | "%";
  trials: number;
  selected: boolean;
  onSelect: () => void;
}) {
  const tone = r.passes ? "pass" : "fail";
  const allowedPpm = (1 - r.yield) * 1e6;
  return (
    <button
      type="button"
      onClick={onSelect}
      aria-pressed={selected}
      aria-label={`${metricLabel(r.metric)}: ${r.passes ? "pass" : "fail"}`}
      className={cn(
        "group relative flex h-full w-full flex-col overflow-hidden rounded-lg border bg-panel text-left shadow-[0_1px_2px_rgba(23,33,43,0.04)] transition-colors",
        selected ? "border-ink/60 ring-1 ring-ink/25" : "border-line hover:border-ink/30",
      )}
    >
      <span className={cn("absolute inset-y-0 left-0 w-1", r.passes ? "bg-pass" : "bg-fail")} aria-hidden="true" />
      <div className="flex items-start justify-between gap-2 px-4 pt-3 pl-5">
        <div className="min-w-0">
          <p className="truncate text-[13px] font-bold text-ink" title={metricLabel(r.metric)}>
            {metricLabel(r.metric)}
          </p>
          <p className="font-mono text-2xs break-all text-ink/50">{r.metric}</p>
        </div>
        <Badge tone={tone} dot>
          {r.passes ? "Pass" : "Fail"}
        </Badge>
      </div>
      <div className="flex items-end justify-between gap-3 px-4 pt-2 pl-5">
        <div>
          <p className="text-2xs font-bold tracking-[0.06em] text-ink/45 uppercase">Predicted yield</p>
          <p className={cn("text-[22px] leading-7 font-extrabold tracking-[-0.01em] tabular-nums", r.passes ? "text-pass" : "text-fail")}>
            {formatYield(r.predictedYield)}
          </p>
        </div>
        <div className="text-right">
          <p className="text-2xs font-bold tracking-[0.06em] text-ink/45 uppercase">Target</p>
          <p className="text-[13px] font-bold text-ink tabular-nums">≥ {formatYield(r.yield)}</p>
        </div>
      </div>
      <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5 px-4 pb-3 pl-5 text-xs">
        <dt className="text-ink/55">95 % interval</dt>
        <dd className="num text-ink">{formatYieldRange(r.ci[0], r.ci[1])}</dd>
        <dt className="text-ink/55">Out of limit</dt>
        <dd className={cn("num font-semibold", r.passes ? "text-ink" : "text-fail")}>{formatPpm(r.ppmOut)}</dd>
        <dt className="text-ink/55">Allowed out</dt>
        <dd className="num text-ink/70">{formatPpm(allowedPpm)}</dd>
        <dt className="text-ink/55">Limit on the absolute value</dt>
        <dd className="num text-ink">
          ≤ <Limit value={r.max} unit={unit} />
        </dd>
        <dt className="text-ink/55">Limit to meet target</dt>
        <dd className="num text-ink">
          <Limit value={r.limitAtTarget} unit={unit} />
        </dd>
      </dl>
      <p
        className={cn(
          "mt-auto border-t border-line/80 bg-paper/60 px-4 py-1.5 pl-5 text-2xs font-semibold",
          r.demonstrated ? "text-pass" : r.passes ? "text-[#8a5a00]" : "text-ink/55",
        )}
      >
        {r.demonstrated
          ? `Demonstrated: the whole interval meets the target (${formatCount(trials)} trials)`
          : r.passes
            ? "Meets the target, but the interval reaches below it: run more trials"
            : r.ci[1] < r.yield
              ? "Misses the target beyond sampling error"
              : "Misses the target; the interval still reaches it"}
      </p>
    </button>
  );
}
