/**
 * What the progress bar says: the fraction done, the pace, and the time left at that pace.
 * The pace is the queue's own (trials done over seconds since the study started), so the
 * time left is an estimate that settles as the run goes on.
 */
import type { StudySummary } from "@shared/schemas/studies";

export interface ProgressView {
  fraction: number;
  done: number;
  total: number;
  rate: number | null;
  /** seconds to the end at the current pace; null while queued or before a pace is known */
  secondsLeft: number | null;
  /** seconds since the run started, when known */
  elapsed: number | null;
}

export function progressView(
  s: Pick<StudySummary, "status" | "progress" | "startedAt">,
  now: number = Date.now(),
): ProgressView {
  const { done, total, trialsPerSecond } = s.progress;
  const fraction = total > 0 ? Math.min(1, Math.max(0, done / total)) : 0;
  const rate = trialsPerSecond && trialsPerSecond > 0 && Number.isFinite(trialsPerSecond) ? trialsPerSecond : null;
  const running = s.status === "running";
  const secondsLeft = running && rate !== null ? Math.max(0, total - done) / rate : null;
  const started = s.startedAt ? Date.parse(s.startedAt) : NaN;
  const elapsed = running && Number.isFinite(started) ? Math.max(0, (now - started) / 1000) : null;
  return { fraction, done, total, rate, secondsLeft, elapsed };
}

/**
 * A first guess at how long a study will take: its trials at the median pace of the
 * project's finished studies. The sweep's size changes the pace, so this is a rough guide.
 */
export function estimateSeconds(trials: number, rates: (number | null)[]): number | null {
  const known = rates.filter((r): r is number => r !== null && Number.isFinite(r) && r > 0).sort((a, b) => a - b);
  if (!known.length || !(trials > 0)) return null;
  const mid = known.length / 2;
  const median = known.length % 2 ? known[Math.floor(mid)] : (known[mid - 1] + known[mid]) / 2;
  return trials / median;
}
