import { formatCount } from "@shared/format";
import { Button } from "@frontend/components/ui/button";
import { CloseIcon } from "@frontend/components/ui/icons";

/**
 * A what-if run's bar: trials done over the whole run (every point or every verifying round),
 * and, for someone who may run what-if runs, the button that stops it.
 */
export function RunProgress({
  label,
  status,
  done,
  total,
  onCancel,
  cancelling = false,
}: {
  label: string;
  status: string;
  done: number;
  total: number;
  onCancel?: () => void;
  cancelling?: boolean;
}) {
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
      {onCancel ? (
        <div className="flex justify-end">
          <Button size="sm" variant="danger-ghost" icon={<CloseIcon size={14} />} onClick={onCancel} pending={cancelling}>
            Cancel {label.toLowerCase()}
          </Button>
        </div>
      ) : null}
    </div>
  );
}

/** The line a cancelled run shows in place of its bar. */
export function RunCancelled({ what, done, total }: { what: string; done: number; total: number }) {
  return (
    <p className="py-1 text-[13px] text-ink/65">
      This {what} was cancelled after {formatCount(done)} of {formatCount(total)} trials.
    </p>
  );
}
