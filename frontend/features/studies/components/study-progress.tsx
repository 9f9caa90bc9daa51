import { useEffect, useRef, useState } from "react";
import type { StudySummary } from "@shared/schemas/studies";
import { Button } from "@frontend/components/ui/button";
import { CloseIcon } from "@frontend/components/ui/icons";
import { cn } from "@frontend/lib/cn";
import { PACE_WINDOW_MS, progressView, recentPace, type ProgressSample } from "../lib/progress";
import { formatCount, formatDuration, formatRate } from "@shared/format";

/**
 * The running study: a bar with trials done, the pace and the time left, and Cancel.
 * A queued study shows an empty bar that says it waits for the queue.
 */
export function StudyProgress({
  study,
  onCancel,
  cancelling = false,
  compact = false,
}: {
  study: Pick<StudySummary, "status" | "progress" | "startedAt" | "number">;
  onCancel?: () => void;
  cancelling?: boolean;
  compact?: boolean;
}) {
  // Elapsed time ticks between polls.
  const [now, setNow] = useState(() => Date.now());
  useEffect(() => {
    if (study.status !== "running") return;
    const t = window.setInterval(() => setNow(Date.now()), 1000);
    return () => window.clearInterval(t);
  }, [study.status]);
  // What this screen has seen of the run, for the recent pace.
  const samples = useRef<ProgressSample[]>([]);
  const last = samples.current[samples.current.length - 1];
  if (study.status === "running" && (!last || last.done !== study.progress.done)) {
    samples.current = [
      ...samples.current.filter((p) => p.at >= Date.now() - 2 * PACE_WINDOW_MS && p.done <= study.progress.done),
      { at: Date.now(), done: study.progress.done },
    ];
  }
  const v = progressView(study, now, recentPace(samples.current, Date.now()));
  const finishing = study.status === "running" && v.total > 0 && v.done >= v.total;
  const queued = study.status === "queued";
  const pct = Math.round(v.fraction * 1000) / 10;

  return (
    <div className={cn("flex flex-col gap-2", compact ? "" : "py-1")}>
      <div className="flex items-baseline justify-between gap-3">
        <p className="text-[13px] font-semibold text-ink">
          {queued ? "Waiting in the queue" : `Running: ${formatCount(v.done)} of ${formatCount(v.total)} trials`}
        </p>
        <p className="num text-[13px] font-bold text-ink">{queued ? "" : `${pct.toFixed(1)} %`}</p>
      </div>
      <div
        role="progressbar"
        aria-label={`Study ${study.number} progress`}
        aria-valuemin={0}
        aria-valuemax={v.total}
        aria-valuenow={v.done}
        aria-valuetext={queued ? "queued" : `${formatCount(v.done)} of ${formatCount(v.total)} trials`}
        className="relative h-2.5 overflow-hidden rounded-full border border-line bg-paper"
      >
        {queued ? (
          <div className="absolute inset-y-0 w-1/4 animate-[orthostack-progress_1.6s_ease-in-out_infinite] rounded-full bg-ink/15" />
        ) : (
          <div className="h-full rounded-full bg-gyro transition-[width] duration-700 ease-out" style={{ width: `${pct}%` }} />
        )}
      </div>
      <div className="flex flex-wrap items-center justify-between gap-x-6 gap-y-2">
        <dl className="flex flex-wrap gap-x-6 gap-y-1 text-xs">
          <ProgressFact label="Pace" value={queued ? "—" : formatRate(v.rate)} />
          <ProgressFact
            label="Time left"
            value={
              queued
                ? "—"
                : finishing
                  ? "writing the result…"
                  : v.secondsLeft === null
                    ? "estimating…"
                    : v.secondsLeft < 1
                      ? "under a second"
                      : `about ${formatDuration(v.secondsLeft)}`
            }
          />
          <ProgressFact label="Elapsed" value={formatDuration(v.elapsed)} />
        </dl>
        {onCancel ? (
          <Button size="sm" variant="danger-ghost" icon={<CloseIcon size={14} />} onClick={onCancel} pending={cancelling}>
            Cancel study
          </Button>
        ) : null}
      </div>
    </div>
  );
}

function ProgressFact({ label, value }: { label: string; value: string }) {
  return (
    <div className="flex items-baseline gap-1.5">
      <dt className="text-2xs font-bold tracking-[0.06em] text-ink/45 uppercase">{label}</dt>
      <dd className="font-semibold text-ink tabular-nums">{value}</dd>
    </div>
  );
}
