import { formatCount } from "@shared/format";

/** A what-if run's bar: trials done over the whole run (every point or every verifying round). */
export function RunProgress({ label, status, done, total }: { label: string; status: string; done: number; total: number }) {
  const queued = status === "queued";
  const fraction = total > 0 ? Math.min(1, done / total) : 0;
  return (
    <div className="flex flex-col gap-1.5 py-1">
      <div className="flex items-baseline justify-between gap-3 text-[13px]">
        <p className="font-semibold text-ink">
          {queued ? "Waiting in the queue" : `${label}: ${formatCount(done)} of ${formatCount(total)} trials`}
        </p>
        <p className="num font-bold text-ink">{queued ? "" : `${(fraction * 100).toFixed(0)} %`}</p>
      </div>
      <div
        role="progressbar"
        aria-label={`${label} progress`}
        aria-valuemin={0}
        aria-valuemax={total}
        aria-valuenow={done}
        className="relative h-2.5 overflow-hidden rounded-full border border-line bg-paper"
      >
        <div className="h-full bg-gyro transition-[width]" style={{ width: `${fraction * 100}%` }} />
      </div>
    </div>
  );
}
