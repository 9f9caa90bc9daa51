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
  /** the pace seen over the last few seconds (recentPace), preferred to the run's average */
  recent: number | null = null,
): ProgressView {
  const { done, total, trialsPerSecond } = s.progress;
  const fraction = total > 0 ? Math.min(1, Math.max(0, done / total)) : 0;
  const average = trialsPerSecond && trialsPerSecond > 0 && Number.isFinite(trialsPerSecond) ? trialsPerSecond : null;
  const rate = recent !== null && recent > 0 && Number.isFinite(recent) ? recent : average;
  const running = s.status === "running";
  const secondsLeft = running && rate !== null ? Math.max(0, total - done) / rate : null;
  const started = s.startedAt ? Date.parse(s.startedAt) : NaN;
  const elapsed = running && Number.isFinite(started) ? Math.max(0, (now - started) / 1000) : null;
  return { fraction, done, total, rate, secondsLeft, elapsed };
}

export type ProgressSample = { at: number; done: number };

/** How far back the recent pace looks, and the least time it needs to say anything. */
export const PACE_WINDOW_MS = 10_000;
const PACE_MIN_SPAN_MS = 2_000;

/**
 * Trials per second over the last few seconds, from the progress seen on screen. The
 * run's own average includes the workers' start-up, so early on it overstates the time
 * left; the recent pace does not. Null until the samples span long enough.
 */
export function recentPace(samples: ProgressSample[], now: number, windowMs = PACE_WINDOW_MS): number | null {
  const inWindow = samples.filter((s) => s.at >= now - windowMs);
  if (inWindow.length < 2) return null;
  const first = inWindow[0];
  const last = inWindow[inWindow.length - 1];
  const span = last.at - first.at;
  if (span < PACE_MIN_SPAN_MS || last.done <= first.done) return null;
  return ((last.done - first.done) * 1000) / span;
}

/**
 * How long a study will take: its work (trials × attitudes of the sweep) at the pace this
 * server showed on the workspace's recent finished studies, measured in the same unit (work
 * per second of run time). Trials alone would mislead: a 0.1° heading step is a hundred times
 * the work of a 10° one at the same trials. Null until a study has finished here.
 */
export function estimateSeconds(work: number, workPerSecond: number | null | undefined): number | null {
  if (!(work > 0) || !workPerSecond || !Number.isFinite(workPerSecond) || workPerSecond <= 0) return null;
  return work / workPerSecond;
}
